//! The plain-language finding and the cautions that go with every result.

use super::format as fmt;
use super::protocol::{Alternative, Report, Statistic, TwoSidedRule};

fn effect_phrase(st: Statistic) -> &'static str {
    match st.effect() {
        Statistic::MedianDifference => "median",
        Statistic::TrimmedMeanDifference => "20% trimmed mean",
        _ => "mean",
    }
}

/// Decimals for the effect and its interval.
pub fn effect_decimals(r: &Report) -> usize {
    let scale = match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => h - l,
        _ => {
            let s = r.groups.iter().map(|g| g.sd).fold(0.0, f64::max);
            if s > 0.0 {
                s
            } else {
                r.effect.abs()
            }
        }
    };
    fmt::decimals_for(scale)
}

/// One sentence: the effect with its interval and the p-value with what it counts.
pub fn sentence(r: &Report) -> String {
    let (first, second) = (&r.groups[0].name, &r.groups[1].name);
    let what = effect_phrase(r.statistic);
    let of = if r.value_label == "value" {
        String::new()
    } else {
        format!(" {}", r.value_label)
    };
    let d = effect_decimals(r);
    let size = fmt::fixed(r.effect.abs(), d);
    let mut s = if fmt::fixed(r.effect, d)
        .trim_start_matches('-')
        .chars()
        .all(|c| c == '0' || c == '.')
    {
        format!("The {what}{of} was practically the same in {first} and {second}")
    } else {
        let dir = if r.effect > 0.0 { "higher" } else { "lower" };
        format!("The {what}{of} was {size} {dir} in {first} than in {second}")
    };
    if let (Some(lo), Some(hi)) = (r.ci.low, r.ci.high) {
        s.push_str(&format!(" ({})", fmt::ci(r.ci.level, lo, hi, d)));
    }
    let stat_words = match r.statistic {
        Statistic::WelchT => "a Welch t".to_string(),
        _ => format!("a difference in {what}s"),
    };
    let how = match (r.alternative, r.two_sided) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            format!("{stat_words} at least this large in either direction")
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            format!("{stat_words} at least this large in the observed direction")
        }
        (Alternative::Greater, _) => format!("{stat_words} at least this far in favour of {first}"),
        (Alternative::Less, _) => format!("{stat_words} at least this far in favour of {second}"),
    };
    let doubled =
        r.alternative == Alternative::TwoSided && r.two_sided == TwoSidedRule::DoubledTail;
    if r.exact {
        s.push_str(&format!(
            "; {how} arose in {} of all {} possible relabellings of the groups (exact {}{}).",
            fmt::count(r.extreme_count),
            fmt::count(r.resamples),
            fmt::p_value(r.p_value),
            if doubled { ", doubled" } else { "" }
        ));
    } else {
        s.push_str(&format!(
            "; {how} arose in {} of {} random relabellings of the groups ({}{}).",
            fmt::count(r.extreme_count),
            fmt::count(r.resamples),
            fmt::p_value(r.p_value),
            if doubled { ", doubled" } else { "" }
        ));
    }
    s
}

/// Cautions that fit this result.
pub fn cautions(r: &Report) -> Vec<String> {
    let mut c = vec![
        "What the test assumes: if the groups did not differ, every relabelling of the values \
         would have been as likely as the one observed (exchangeability, as under random \
         assignment), and the observations are independent of each other (no repeated \
         measurements of the same unit, no clusters)."
            .to_string(),
        "A p-value says how unusual the observed difference would be if there were none; it \
         is not the size or the importance of the difference. Read it together with the interval."
            .to_string(),
    ];
    let smallest = r.groups.iter().map(|g| g.n).min().unwrap_or(0);
    if smallest < 10 {
        c.push(format!(
            "Small sample: the smallest group has {smallest} values. Bootstrap intervals tend \
             to be too narrow for samples this small (percentile intervals most of all; \
             Hesterberg 2015), and a permutation test has little power."
        ));
    }
    if r.statistic != Statistic::WelchT && r.statistic != Statistic::MedianDifference {
        let (s1, s2) = (r.groups[0].sd, r.groups[1].sd);
        let ratio = if s1.min(s2) > 0.0 {
            s1.max(s2) / s1.min(s2)
        } else {
            1.0
        };
        if ratio > 2.0 && r.groups[0].n != r.groups[1].n {
            c.push(format!(
                "The spreads differ (SD ratio {}) and the groups have different sizes: a \
                 relabelling test of a difference in means then also reacts to the unequal \
                 spread. The Welch t statistic is the safer choice here (Chung & Romano 2013).",
                fmt::sig(ratio)
            ));
        }
    }
    c.push(
        "Several tests on the same data: some small p-values arise by chance alone. If this is \
         one of several comparisons, adjust for their number (for example Holm's method)."
            .to_string(),
    );
    c.push(
        "Clinical, safety or regulatory decisions need a qualified statistician and the \
         guidelines that apply to them; this result alone is not enough."
            .to_string(),
    );
    c
}
