//! The hints from the data in words: each says what was seen, the rule and its source, and
//! what it suggests; none changes the analysis.

use crate::base::format as fmt;
use crate::designs::hints::{Hint, FAR_OUT, PAIRED_R, SKEW_LIMIT};

/// The heading of the hints' section.
pub const HEADING: &str = "What the data suggest (hints; the analysis above is unchanged)";

/// One hint in words.
pub fn hint(h: &Hint) -> String {
    match h {
        Hint::Skewed {
            group,
            skewness,
            percentile,
        } => format!(
            "{group} is strongly skewed (skewness {:.2}; rule: beyond ±{}, common practice, \
             Bulmer 1979). A mean follows the long tail; the difference in medians or in 20% \
             trimmed means answers a question less moved by it{}.",
            skewness,
            fmt::plain(SKEW_LIMIT),
            if *percentile {
                ", and the BCa interval corrects for skew where the percentile interval does \
                 not (Efron 1987)"
            } else {
                ""
            }
        ),
        Hint::FarOut {
            group,
            count,
            low_fence,
            high_fence,
        } => format!(
            "{count} {} of {group} {} beyond Tukey's far-out fences ({} to {}: {} interquartile \
             ranges beyond the quartiles; Tukey 1977). Check {} for errors of entry; a mean \
             and its test react strongly to such values, a median or trimmed mean much less.",
            if *count == 1 { "value" } else { "values" },
            if *count == 1 { "lies" } else { "lie" },
            fmt::sig(*low_fence),
            fmt::sig(*high_fence),
            fmt::plain(FAR_OUT),
            if *count == 1 { "it" } else { "them" },
        ),
        Hint::FewDistinct { distinct, values } => format!(
            "Only {} distinct values among {}: the relabelling distribution is discrete and the \
             p-value moves in steps (rule: fewer than 10 distinct values, or fewer than half as \
             many as values; common practice). The exact test, where the groups are small \
             enough to enumerate, gives those steps exactly; the mid-p-value (Lancaster 1961) \
             can be mentioned beside it, but it is not a test that keeps its level.",
            fmt::count(*distinct as u64),
            fmt::count(*values as u64)
        ),
        Hint::LooksPaired { r, rows } => format!(
            "The two columns rise and fall together row by row (r = {:.2} over {} rows; rule: \
             r above {}, common practice). If each row is one unit measured twice, use the \
             paired design: it compares within units, while this design assumes independent \
             groups.",
            r,
            fmt::count(*rows as u64),
            fmt::plain(PAIRED_R)
        ),
    }
}

/// Every hint in words (none: an empty list).
pub fn hints(hs: &[Hint]) -> Vec<String> {
    hs.iter().map(hint).collect()
}
