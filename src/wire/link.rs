//! Share links: the whole analysis (data, settings, seed, format version) in the URL
//! fragment, so it never reaches a server. The job is written as JSON, compressed with
//! deflate (miniz_oxide) and encoded as URL-safe base64 without padding:
//!
//! `https://…/index.html#r1.<payload>`
//!
//! Decoding never runs anything: it yields a typed [`Job`] or a message saying what is wrong.

use base64::engine::general_purpose::URL_SAFE_NO_PAD;
use base64::Engine;

use super::Job;
use crate::base::FORMAT_VERSION;

/// The fragment prefix; the digit is the link format version.
pub const PREFIX: &str = "r1.";

/// Links longer than this may be cut off by chat and mail programs.
pub const LONG_LINK: usize = 8000;

/// The most a link may decompress to (a guard against decompression bombs).
pub const MAX_DECODED: usize = 8 * 1024 * 1024;

/// The most a link may hold before decoding.
pub const MAX_ENCODED: usize = 4 * 1024 * 1024;

/// The fragment for a job (without the '#').
pub fn encode(job: &Job) -> String {
    let json = serde_json::to_vec(job).unwrap_or_default();
    let packed = miniz_oxide::deflate::compress_to_vec(&json, 9);
    format!("{PREFIX}{}", URL_SAFE_NO_PAD.encode(packed))
}

/// A full link: `base` (the page's address, any fragment removed) plus the fragment.
pub fn link(base: &str, job: &Job) -> String {
    let base = base.split('#').next().unwrap_or(base);
    format!("{base}#{}", encode(job))
}

/// Reads a job from a link, a fragment with or without '#', or the bare payload.
pub fn decode(text: &str) -> Result<Job, String> {
    let text = text.trim();
    if text.len() > MAX_ENCODED {
        return Err(format!(
            "This link is {} characters long, more than a share link can be ({}). Open the analysis from a saved file instead.",
            text.len(),
            MAX_ENCODED
        ));
    }
    let frag = match text.rfind('#') {
        Some(i) => &text[i + 1..],
        None => text,
    };
    if frag.is_empty() {
        return Err("The link has no analysis in it (nothing after '#').".into());
    }
    let Some(payload) = frag.strip_prefix(PREFIX) else {
        if let Some(rest) = frag.strip_prefix('r') {
            if let Some((v, _)) = rest.split_once('.') {
                if v.chars().all(|c| c.is_ascii_digit()) {
                    return Err(format!(
                        "This link was made by a newer version of Reshuffle (link format {v}); this page reads format 1."
                    ));
                }
            }
        }
        return Err("This is not a Reshuffle analysis link (it should end in '#r1.' and a code). It may have been cut off or changed.".into());
    };
    let packed = URL_SAFE_NO_PAD
        .decode(payload.trim_end_matches('='))
        .map_err(|_| "The link is damaged: its code contains characters a Reshuffle link never has. It may have been cut off or changed by the program that carried it.".to_string())?;
    let json = miniz_oxide::inflate::decompress_to_vec_with_limit(&packed, MAX_DECODED).map_err(|e| {
        if matches!(e.status, miniz_oxide::inflate::TINFLStatus::HasMoreOutput) {
            format!("The link unpacks to more than {} MB, more than an analysis link can hold.", MAX_DECODED / 1024 / 1024)
        } else {
            "The link is damaged or incomplete (it could not be unpacked); ask for it again, or for the analysis file.".to_string()
        }
    })?;
    let job: Job = serde_json::from_slice(&json)
        .map_err(|e| format!("The link's contents could not be read as an analysis ({e}). It may come from another version of Reshuffle."))?;
    let v = job.format_version();
    if v != FORMAT_VERSION {
        return Err(format!(
            "This link holds an analysis in format version {v}; this page reads version {FORMAT_VERSION}."
        ));
    }
    Ok(job)
}

/// The same job without its data, for a settings-only link.
pub fn without_data(job: &Job) -> Job {
    let mut j = job.clone();
    j.clear_data();
    j
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::designs::two_groups::Request;
    use crate::resample::rng::{Purpose, Stream};

    fn job() -> Job {
        Job::Compare(Request::new("y,g\n1,a\n2,a\n3,b\n4,b\n".into(), 42))
    }

    #[test]
    fn round_trip_through_a_link() {
        let j = job();
        let l = link("http://127.0.0.1:8080/index.html#old", &j);
        assert!(l.starts_with("http://127.0.0.1:8080/index.html#r1."));
        assert!(
            !l.contains('+') && !l.contains('/') || l.find('#').unwrap() > l.rfind('/').unwrap()
        );
        assert_eq!(decode(&l).unwrap(), j);
        assert_eq!(decode(&encode(&j)).unwrap(), j);
    }

    #[test]
    fn bad_links_say_what_is_wrong() {
        let good = encode(&job());
        assert!(decode("http://x/#").unwrap_err().contains("nothing after"));
        assert!(decode("#hello")
            .unwrap_err()
            .contains("not a Reshuffle analysis link"));
        assert!(decode("#r7.abc").unwrap_err().contains("newer version"));
        assert!(decode("#r1.@@@").unwrap_err().contains("damaged"));
        let cut = &good[..good.len() / 2];
        assert!(
            decode(cut).unwrap_err().contains("damaged"),
            "{:?}",
            decode(cut)
        );
        // Valid deflate of something that is not an analysis.
        let junk = format!(
            "{PREFIX}{}",
            URL_SAFE_NO_PAD.encode(miniz_oxide::deflate::compress_to_vec(
                b"{\"job\":\"rm -rf\"}",
                6
            ))
        );
        assert!(decode(&junk)
            .unwrap_err()
            .contains("could not be read as an analysis"));
        // A future format version inside a well-formed link.
        let mut r = Request::new("y\n1\n".into(), 1);
        r.format_version = 9;
        assert!(decode(&encode(&Job::Compare(r)))
            .unwrap_err()
            .contains("version 9"));
    }

    #[test]
    fn a_decompression_bomb_is_refused() {
        let zeros = vec![b' '; MAX_DECODED + 10];
        let bomb = format!(
            "{PREFIX}{}",
            URL_SAFE_NO_PAD.encode(miniz_oxide::deflate::compress_to_vec(&zeros, 9))
        );
        assert!(bomb.len() < 20_000);
        assert!(decode(&bomb).unwrap_err().contains("more than"));
    }

    /// Randomised robustness test of the decoder ("fuzzing" with a fixed seed): truncations,
    /// byte flips, insertions and random strings must give an error or a valid job, never a
    /// panic.
    #[test]
    fn decoder_survives_random_damage() {
        let good = encode(&job());
        let alphabet: Vec<char> =
            "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_.#r%=+/ é\u{0}"
                .chars()
                .collect();
        let mut s = Stream::new(5, Purpose::Permutation, 0);
        for _ in 0..20_000 {
            let mut t: Vec<char> = good.chars().collect();
            match s.below(4) {
                0 => t.truncate(s.below(t.len() as u64) as usize),
                1 => {
                    let i = s.below(t.len() as u64) as usize;
                    t[i] = alphabet[s.below(alphabet.len() as u64) as usize];
                }
                2 => {
                    let i = s.below(t.len() as u64) as usize;
                    t.insert(i, alphabet[s.below(alphabet.len() as u64) as usize]);
                }
                _ => {
                    let n = s.below(200) as usize;
                    t = (0..n)
                        .map(|_| alphabet[s.below(alphabet.len() as u64) as usize])
                        .collect();
                }
            }
            let text: String = t.into_iter().collect();
            let _ = decode(&text);
        }
    }

    #[test]
    fn settings_only_links_drop_the_data() {
        let j = without_data(&job());
        match decode(&encode(&j)).unwrap() {
            Job::Compare(r) => assert!(r.data.is_empty()),
            _ => unreachable!(),
        }
    }
}
