//! Counts typed in for a yes/no comparison: "42/300, 61/310" or "control: 42/300; new: 61/310".

use serde::{Deserialize, Serialize};

/// One group's counts: `yes` of `n`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CountGroup {
    pub name: String,
    pub yes: u64,
    pub n: u64,
}

/// Reads counts typed as "42/300, 61/310", "42 of 300 vs 61 of 310" or
/// "control: 42/300; new: 61/310" (a name before ':' or '=').
pub fn parse_counts(text: &str) -> Result<Vec<CountGroup>, String> {
    let example = "Write each group as yes/total, for example \"42/300, 61/310\" or \
                   \"control: 42/300; new page: 61/310\".";
    let normalised = text
        .replace(" vs. ", ";")
        .replace(" vs ", ";")
        .replace('\n', ";");
    let parts: Vec<&str> = normalised
        .split([';', ','])
        .map(str::trim)
        .filter(|p| !p.is_empty())
        .collect();
    if parts.is_empty() {
        return Err(format!("No counts were given. {example}"));
    }
    let mut out = Vec::new();
    for (i, part) in parts.iter().enumerate() {
        // The counts never hold ':' or '=', so the name ends at the last one (a name may
        // hold them, e.g. "dose=10mg: 3/20").
        let (name, counts) = match part.rfind([':', '=']) {
            Some(at) => (part[..at].trim().to_string(), part[at + 1..].trim()),
            None => (String::new(), *part),
        };
        let pieces: Vec<&str> = if counts.contains('/') {
            counts.split('/').map(str::trim).collect()
        } else {
            counts.split(" of ").map(str::trim).collect()
        };
        let num = |s: &str| s.replace(['_', ' '], "").parse::<u64>().ok();
        let (yes, n) = match pieces.as_slice() {
            [y, n] => match (num(y), num(n)) {
                (Some(y), Some(n)) => (y, n),
                _ => {
                    return Err(format!(
                        "\"{part}\" is not a count of yes answers out of a total (whole \
                         numbers). {example}"
                    ))
                }
            },
            _ => {
                return Err(format!(
                    "\"{part}\" is not of the form yes/total. {example}"
                ))
            }
        };
        let name = if name.is_empty() {
            format!("group {}", i + 1)
        } else {
            name
        };
        if n == 0 {
            return Err(format!(
                "Group \"{name}\" has a total of 0; each group needs units."
            ));
        }
        if yes > n {
            return Err(format!(
                "Group \"{name}\" has {yes} yes answers out of {n}: the yes answers cannot \
                 outnumber the total. {example}"
            ));
        }
        out.push(CountGroup { name, yes, n });
    }
    if out.len() != 2 {
        return Err(format!(
            "{} group{} given; this comparison needs exactly two. {example}",
            out.len(),
            if out.len() == 1 { " was" } else { "s were" }
        ));
    }
    if out[0].name == out[1].name {
        return Err(format!(
            "Both groups are called \"{}\"; give them different names.",
            out[0].name
        ));
    }
    Ok(out)
}
