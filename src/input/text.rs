//! Turning the bytes of a data file into text: UTF-8 with or without a byte-order mark, and
//! UTF-16 files (what some spreadsheets write as "Unicode text") when they start with a mark.
//! Anything else that is not valid UTF-8 is refused with the line and the byte where reading
//! stopped, rather than guessed at, so that no group name silently changes.

use crate::base::Error;

/// Decodes a data file's bytes; `name` is used in the message.
pub fn decode(bytes: &[u8], name: &str) -> Result<String, Error> {
    if let Some(rest) = bytes.strip_prefix(&[0xEF, 0xBB, 0xBF]) {
        return utf8(rest, name);
    }
    if let Some(rest) = bytes.strip_prefix(&[0xFF, 0xFE]) {
        return utf16(rest, name, u16::from_le_bytes);
    }
    if let Some(rest) = bytes.strip_prefix(&[0xFE, 0xFF]) {
        return utf16(rest, name, u16::from_be_bytes);
    }
    utf8(bytes, name)
}

fn utf8(bytes: &[u8], name: &str) -> Result<String, Error> {
    match std::str::from_utf8(bytes) {
        Ok(s) => Ok(s.to_string()),
        Err(e) => {
            let at = e.valid_up_to();
            let line = 1 + bytes[..at].iter().filter(|&&b| b == b'\n').count();
            Err(Error::data(format!(
                "\"{name}\" is not UTF-8 text: byte {} (on line {line}) is 0x{:02X}, which UTF-8 does not allow there. \
                 Save the file as UTF-8 (\"CSV UTF-8\" in a spreadsheet) and open it again.",
                at + 1,
                bytes[at]
            ))
            .at_line(line as u64))
        }
    }
}

fn utf16(bytes: &[u8], name: &str, unit: fn([u8; 2]) -> u16) -> Result<String, Error> {
    if bytes.len() % 2 != 0 {
        return Err(Error::data(format!(
            "\"{name}\" starts like UTF-16 text but has an odd number of bytes, so it was cut short. \
             Save it again, preferably as UTF-8."
        )));
    }
    let units = bytes.chunks_exact(2).map(|c| unit([c[0], c[1]]));
    let mut out = String::with_capacity(bytes.len() / 2);
    for (i, c) in char::decode_utf16(units).enumerate() {
        match c {
            Ok(c) => out.push(c),
            Err(_) => {
                let line = 1 + out.matches('\n').count();
                return Err(Error::data(format!(
                    "\"{name}\" is UTF-16 text with a broken character at position {} (line {line}). \
                     Save it again, preferably as UTF-8.",
                    i + 1
                ))
                .at_line(line as u64));
            }
        }
    }
    Ok(out)
}

/// A 64-bit fingerprint of a text (FNV-1a over its bytes): to tell cheaply whether a text is
/// the one seen before (not a check against tampering; links use SHA-256 for that).
pub fn fingerprint(text: &str) -> u64 {
    text.bytes().fold(0xcbf2_9ce4_8422_2325, |h, b| {
        (h ^ u64::from(b)).wrapping_mul(0x0000_0100_0000_01b3)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    // Byte-order marks and encodings as defined by the Unicode Standard, chapter 3 (UTF-8,
    // UTF-16LE/BE) and section 23.8 (U+FEFF as a byte-order mark).
    #[test]
    fn marks_and_encodings() {
        assert_eq!(decode(b"\xEF\xBB\xBFa,b\n", "f").unwrap(), "a,b\n");
        assert_eq!(decode("größe\n".as_bytes(), "f").unwrap(), "größe\n");
        let le: Vec<u8> = [0xFF, 0xFE]
            .into_iter()
            .chain("é,1\n".encode_utf16().flat_map(|u| u.to_le_bytes()))
            .collect();
        assert_eq!(decode(&le, "f").unwrap(), "é,1\n");
        let be: Vec<u8> = [0xFE, 0xFF]
            .into_iter()
            .chain("x\ny".encode_utf16().flat_map(|u| u.to_be_bytes()))
            .collect();
        assert_eq!(decode(&be, "f").unwrap(), "x\ny");
    }

    #[test]
    fn latin1_is_refused_with_its_place() {
        // "caf\xE9" is "café" in ISO-8859-1 / Windows-1252, not valid UTF-8.
        let e = decode(b"group,value\ncaf\xE9,1\n", "data.csv").unwrap_err();
        assert_eq!(e.line, Some(2));
        assert!(e.message.contains("byte 16"), "{}", e.message);
        assert!(e.message.contains("0xE9"), "{}", e.message);
        let odd = decode(&[0xFF, 0xFE, 0x41], "u.txt").unwrap_err();
        assert!(odd.message.contains("odd number"), "{}", odd.message);
        let lone = decode(&[0xFF, 0xFE, 0x00, 0xD8, 0x41, 0x00], "u.txt").unwrap_err();
        assert!(
            lone.message.contains("broken character"),
            "{}",
            lone.message
        );
    }
}
