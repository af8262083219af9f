//! Numbers and sentences in the style of scientific reports: "p < .001", "p = .042",
//! "95% CI [0.30, 1.50]", counts with thousands separators.

/// p-value as reports write it: no leading zero, three decimals, "p < .001" below that.
pub fn p_value(p: f64) -> String {
    if p < 0.001 {
        "p < .001".into()
    } else if p >= 0.9995 {
        "p = 1".into()
    } else {
        format!("p = {}", strip_zero(&format!("{p:.3}")))
    }
}

/// The number alone, e.g. ".004" or "< .001".
pub fn p_number(p: f64) -> String {
    let s = p_value(p);
    s.trim_start_matches("p ")
        .trim_start_matches("= ")
        .to_string()
}

fn strip_zero(s: &str) -> String {
    if let Some(rest) = s.strip_prefix("0.") {
        format!(".{rest}")
    } else if let Some(rest) = s.strip_prefix("-0.") {
        format!("-.{rest}")
    } else {
        s.to_string()
    }
}

/// Decimals that show a quantity whose uncertainty is about `scale` to two significant
/// digits of that uncertainty (at least 0, at most 6).
pub fn decimals_for(scale: f64) -> usize {
    if !scale.is_finite() || scale <= 0.0 {
        return 2;
    }
    (1.0 - libm::log10(scale).floor()).clamp(0.0, 6.0) as usize
}

pub fn fixed(x: f64, decimals: usize) -> String {
    if !x.is_finite() {
        return if x.is_nan() {
            "undefined".into()
        } else if x > 0.0 {
            "∞".into()
        } else {
            "−∞".into()
        };
    }
    // Quantities far below the finest fixed decimals (values near 1e-300, say) would all
    // read as zero: write them in scientific notation instead.
    if decimals >= 6 && x != 0.0 && x.abs() < 5e-7 {
        return format!("{x:.3e}");
    }
    let s = format!("{x:.decimals$}");
    // Avoid "-0.00".
    if s.starts_with('-') && s[1..].chars().all(|c| c == '0' || c == '.') {
        s[1..].to_string()
    } else {
        s
    }
}

/// General number with about four significant digits.
pub fn sig(x: f64) -> String {
    if x == 0.0 {
        return "0".into();
    }
    if !x.is_finite() {
        return fixed(x, 0);
    }
    let mag = libm::log10(x.abs()).floor() as i32;
    if !(-4..6).contains(&mag) {
        return format!("{x:.3e}");
    }
    let dec = (3 - mag).max(0) as usize;
    fixed(x, dec)
}

/// A number as a person would type it: about four significant digits, no trailing zeros
/// ("0.5", "1", "0.05", "1.234e-5").
pub fn plain(x: f64) -> String {
    let s = sig(x);
    if s.contains('e') || !s.contains('.') {
        return s;
    }
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// Integer with thousands separators: 100000 -> "100,000".
pub fn count(n: u64) -> String {
    let s = n.to_string();
    let mut out = String::new();
    for (i, c) in s.chars().enumerate() {
        if i > 0 && (s.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(c);
    }
    out
}

/// "95%" from 0.95, "99.5%" from 0.995.
pub fn percent(level: f64) -> String {
    let p = level * 100.0;
    if (p - p.round()).abs() < 1e-9 {
        format!("{}%", p.round() as i64)
    } else {
        let s = format!("{p:.2}");
        format!("{}%", s.trim_end_matches('0').trim_end_matches('.'))
    }
}

/// A share (0 to 1) as a percentage for a sentence: "31.2%", "0.4%", "0.02%",
/// "less than 0.01%", "none".
pub fn percent_share(x: f64) -> String {
    if !x.is_finite() {
        return "an undefined share".into();
    }
    let p = x * 100.0;
    let s = if x <= 0.0 {
        return "none".into();
    } else if p < 0.01 {
        return "less than 0.01%".into();
    } else if p < 0.1 {
        format!("{p:.2}")
    } else {
        format!("{p:.1}")
    };
    let s = if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
    };
    format!("{s}%")
}

/// "95% CI [0.30, 1.50]"
pub fn ci(level: f64, low: f64, high: f64, decimals: usize) -> String {
    format!(
        "{} CI [{}, {}]",
        percent(level),
        fixed(low, decimals),
        fixed(high, decimals)
    )
}

/// A cell's text as a message quotes it: at most 40 characters, cut with "…" and the
/// length, so that a 1 MB cell (say, after an unterminated quote) does not flood the message.
pub fn brief(text: &str) -> String {
    const MAX: usize = 40;
    let n = text.chars().count();
    if n <= MAX {
        return text.to_string();
    }
    let head: String = text.chars().take(MAX).collect();
    format!("{head}… ({} characters)", count(n as u64))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn p_values_as_reports_write_them() {
        assert_eq!(p_value(0.0041), "p = .004");
        assert_eq!(p_value(0.00099), "p < .001");
        assert_eq!(p_value(0.05), "p = .050");
        assert_eq!(p_value(1.0), "p = 1");
        assert_eq!(p_number(0.5), ".500");
    }

    #[test]
    fn counts_and_levels() {
        assert_eq!(count(100_000), "100,000");
        assert_eq!(count(412), "412");
        assert_eq!(count(1_234_567), "1,234,567");
        assert_eq!(percent(0.95), "95%");
        assert_eq!(percent(0.995), "99.5%");
        assert_eq!(ci(0.95, 0.3, 1.5, 2), "95% CI [0.30, 1.50]");
        assert_eq!(fixed(-0.0001, 2), "0.00");
        assert_eq!(plain(0.5), "0.5");
        assert_eq!(plain(1.0), "1");
        assert_eq!(plain(0.05), "0.05");
        assert_eq!(plain(12.25), "12.25");
        assert_eq!(percent_share(0.312), "31.2%");
        assert_eq!(percent_share(0.004), "0.4%");
        assert_eq!(percent_share(0.5), "50%");
        assert_eq!(percent_share(0.0002), "0.02%");
        assert_eq!(percent_share(0.00001), "less than 0.01%");
        assert_eq!(percent_share(0.0), "none");
    }

    #[test]
    fn decimals_follow_the_scale() {
        assert_eq!(decimals_for(1.2), 1);
        assert_eq!(decimals_for(0.6), 2);
        assert_eq!(decimals_for(25.0), 0);
        assert_eq!(decimals_for(0.012), 3);
    }
}
