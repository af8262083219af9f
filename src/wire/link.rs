//! Share links: the whole analysis (data, settings, seed, format version) in the URL
//! fragment, so it never reaches a server. The saved-analysis JSON is compressed with
//! deflate (miniz_oxide) and encoded as URL-safe base64 without padding, followed by an
//! integrity check: the first 12 characters of the URL-safe base64 SHA-256 of the payload.
//!
//! `https://…/index.html#r2.<payload>.<check>`
//!
//! Version-1 links (`#r1.<payload>`, no check) still open. Decoding never runs anything: it
//! yields a typed [`Job`] or an error saying what is wrong.

use base64::engine::general_purpose::URL_SAFE_NO_PAD;
use base64::Engine;
use sha2::{Digest, Sha256};

use super::{read_job, write_job, Job};
use crate::base::{Error, ErrorKind};

/// The fragment prefix of the links this build writes; the digit is the link format version.
pub const PREFIX: &str = "r2.";

/// The prefix of version-1 links.
pub const PREFIX_V1: &str = "r1.";

/// Links longer than this may be cut off by chat and mail programs.
pub const LONG_LINK: usize = 8000;

/// The most a link may decompress to (a guard against decompression bombs).
pub const MAX_DECODED: usize = 8 * 1024 * 1024;

/// The most a link may hold before decoding.
pub const MAX_ENCODED: usize = 4 * 1024 * 1024;

/// Characters of the integrity check.
const CHECK_LEN: usize = 12;

fn check_of(payload: &str) -> String {
    let digest = Sha256::digest(payload.as_bytes());
    URL_SAFE_NO_PAD.encode(digest)[..CHECK_LEN].to_string()
}

/// The fragment for a job (without the '#').
pub fn encode(job: &Job) -> String {
    let packed = miniz_oxide::deflate::compress_to_vec(write_job(job).as_bytes(), 9);
    let payload = URL_SAFE_NO_PAD.encode(packed);
    let check = check_of(&payload);
    format!("{PREFIX}{payload}.{check}")
}

/// A full link: `base` (the page's address, any fragment removed) plus the fragment.
pub fn link(base: &str, job: &Job) -> String {
    let base = base.split('#').next().unwrap_or(base);
    format!("{base}#{}", encode(job))
}

/// What a link held.
#[derive(Clone, Debug, PartialEq)]
pub struct Decoded {
    /// The job.
    pub job: Job,
    /// The link format version (1 or 2).
    pub version: u32,
    /// Whether the link carried an integrity check (version-1 links carry none).
    pub checked: bool,
}

fn damaged(message: &str) -> Error {
    Error::new(ErrorKind::Link, message)
}

/// Reads a job from a link, a fragment with or without '#', or the bare fragment.
pub fn decode(text: &str) -> Result<Decoded, Error> {
    let text = text.trim();
    if text.len() > MAX_ENCODED {
        return Err(Error::new(
            ErrorKind::Limit,
            format!(
                "This link is {} characters long, more than a share link can be ({}). Open the \
                 analysis from a saved file instead.",
                text.len(),
                MAX_ENCODED
            ),
        ));
    }
    let frag = match text.rfind('#') {
        Some(i) => &text[i + 1..],
        None => text,
    };
    if frag.is_empty() {
        return Err(damaged(
            "The link has no analysis in it (nothing after '#').",
        ));
    }
    let (payload, version, checked) = if let Some(rest) = frag.strip_prefix(PREFIX) {
        let Some((payload, check)) = rest.rsplit_once('.') else {
            return Err(damaged(
                "This link was changed or cut: its integrity check is missing. Ask for the link \
                 again, or for the analysis file.",
            ));
        };
        if check != check_of(payload) {
            return Err(damaged(
                "This link was changed or cut: its contents do not match its integrity check. \
                 Ask for the link again, or for the analysis file.",
            ));
        }
        (payload, 2, true)
    } else if let Some(payload) = frag.strip_prefix(PREFIX_V1) {
        (payload, 1, false)
    } else {
        if let Some(rest) = frag.strip_prefix('r') {
            if let Some((v, _)) = rest.split_once('.') {
                if !v.is_empty() && v.chars().all(|c| c.is_ascii_digit()) {
                    return Err(Error::new(
                        ErrorKind::Version,
                        format!(
                            "This link was made by a newer version of Reshuffle (link format \
                             {v}); this page reads formats 1 and 2."
                        ),
                    ));
                }
            }
        }
        return Err(damaged(
            "This is not a Reshuffle analysis link (it should end in '#r2.' and a code). It may \
             have been cut off or changed.",
        ));
    };
    let packed = URL_SAFE_NO_PAD
        .decode(payload.trim_end_matches('='))
        .map_err(|_| {
            damaged(
                "The link is damaged: its code contains characters a Reshuffle link never has. \
                 It may have been cut off or changed by the program that carried it.",
            )
        })?;
    let json =
        miniz_oxide::inflate::decompress_to_vec_with_limit(&packed, MAX_DECODED).map_err(|e| {
            if matches!(e.status, miniz_oxide::inflate::TINFLStatus::HasMoreOutput) {
                Error::new(
                    ErrorKind::Limit,
                    format!(
                        "The link unpacks to more than {} MB, more than an analysis link can \
                         hold.",
                        MAX_DECODED / 1024 / 1024
                    ),
                )
            } else {
                damaged(
                    "The link is damaged or incomplete (it could not be unpacked); ask for it \
                     again, or for the analysis file.",
                )
            }
        })?;
    let text = String::from_utf8(json).map_err(|_| {
        damaged("The link's contents are not text; it may have been changed or cut.")
    })?;
    let read = read_job(&text).map_err(|e| {
        if e.kind == ErrorKind::Version {
            e
        } else {
            Error::new(
                ErrorKind::Link,
                format!(
                    "The link's contents could not be read as an analysis: {} It may come from \
                     another version of Reshuffle.",
                    e.message
                ),
            )
        }
    })?;
    if read.version != version {
        return Err(damaged(
            "The link's format and its contents disagree; it may have been changed.",
        ));
    }
    Ok(Decoded {
        job: read.job,
        version,
        checked,
    })
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
    use crate::designs::two_groups::TwoGroupsRequest;
    use crate::resample::rng::{Purpose, Stream};

    fn job() -> Job {
        Job::TwoGroups(TwoGroupsRequest::new(
            "y,g\n1,a\n2,a\n3,b\n4,b\n".into(),
            42,
        ))
    }

    #[test]
    fn round_trip_through_a_link() {
        let j = job();
        let l = link("http://127.0.0.1:8080/index.html#old", &j);
        assert!(l.starts_with("http://127.0.0.1:8080/index.html#r2."));
        let d = decode(&l).unwrap();
        assert_eq!(d.job, j);
        assert!(d.checked);
        assert_eq!(decode(&encode(&j)).unwrap().job, j);
    }

    #[test]
    fn an_edited_or_cut_link_is_refused() {
        let good = encode(&job());
        // Change one character of the payload (keeping it valid base64).
        let i = good.len() / 2;
        let c = good.as_bytes()[i];
        let swap = if c == b'A' { 'B' } else { 'A' };
        let mut edited = good.clone();
        edited.replace_range(i..i + 1, &swap.to_string());
        let e = decode(&edited).unwrap_err();
        assert!(e.message.contains("changed or cut"), "{e}");
        let cut = &good[..good.len() - 20];
        assert!(decode(cut).unwrap_err().message.contains("changed or cut"));
        let no_check = good.rsplit_once('.').unwrap().0;
        assert!(decode(no_check).is_err());
    }

    #[test]
    fn bad_links_say_what_is_wrong() {
        assert!(decode("http://x/#")
            .unwrap_err()
            .message
            .contains("nothing after"));
        assert!(decode("#hello")
            .unwrap_err()
            .message
            .contains("not a Reshuffle analysis link"));
        assert_eq!(decode("#r7.abc").unwrap_err().kind, ErrorKind::Version);
        assert!(decode("#r1.@@@").unwrap_err().message.contains("damaged"));
        // Valid deflate of something that is not an analysis (version-1 prefix, no check).
        let junk = format!(
            "{PREFIX_V1}{}",
            URL_SAFE_NO_PAD.encode(miniz_oxide::deflate::compress_to_vec(
                b"{\"job\":\"rm -rf\"}",
                6
            ))
        );
        assert!(decode(&junk)
            .unwrap_err()
            .message
            .contains("could not be read as an analysis"));
    }

    #[test]
    fn a_decompression_bomb_is_refused() {
        let zeros = vec![b' '; MAX_DECODED + 10];
        let payload = URL_SAFE_NO_PAD.encode(miniz_oxide::deflate::compress_to_vec(&zeros, 9));
        let bomb = format!("{PREFIX}{payload}.{}", check_of(&payload));
        assert!(bomb.len() < 20_000);
        let e = decode(&bomb).unwrap_err();
        assert_eq!(e.kind, ErrorKind::Limit);
        assert!(e.message.contains("more than"), "{e}");
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
        match decode(&encode(&j)).unwrap().job {
            Job::TwoGroups(r) => assert!(r.data.is_empty()),
            _ => unreachable!(),
        }
    }
}
