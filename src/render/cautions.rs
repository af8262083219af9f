//! The wording of the cautions that close every report: what the test assumes, small samples,
//! unequal spreads, multiplicity and the limits of a p-value, worded for each design.

use super::words::{plural, strata_weights};
use crate::base::format as fmt;

/// What a caution says, for the design it comes with.
pub fn caution(c: &crate::designs::Caution, design: crate::designs::DesignKey) -> String {
    use crate::designs::{Caution, DesignKey};
    match c {
        Caution::Assumptions => match design {
            DesignKey::TwoGroups => "What the test assumes: if the groups did not differ, every \
                 relabelling of the values would have been as likely as the one observed \
                 (exchangeability, as under random assignment), and the observations are \
                 independent of each other (no repeated measurements of the same unit, no \
                 clusters)."
                .into(),
            DesignKey::Paired => "What the test assumes: the pairs are independent of each \
                 other, and if there were no effect each difference would be as likely positive \
                 as negative (the two measurements of a unit are exchangeable)."
                .into(),
            DesignKey::OneSample => "What the test assumes: the values are independent, and if \
                 the true centre were the reference value their distribution would be symmetric \
                 about it. Skewed data can make a sign-flip test mislead; the bootstrap interval \
                 does not need symmetry."
                .into(),
            DesignKey::Association => "What the test assumes: the (x, y) rows are independent of \
                 each other, and if there were no association every re-pairing of y with x would \
                 have been as likely as the observed one."
                .into(),
            DesignKey::KGroups => "What the test assumes: if the groups did not differ, every \
                 relabelling of the values across the groups would have been as likely as the \
                 one observed (exchangeability, as under random assignment), and the \
                 observations are independent of each other."
                .into(),
            DesignKey::Stratified => "What the test assumes: within each stratum, if the groups \
                 did not differ, every relabelling of that stratum's values would have been as \
                 likely as the one observed (as when units are randomised within each site, \
                 batch or day), and the observations are independent of each other."
                .into(),
            DesignKey::YesNo => "What the test assumes: each unit contributes one yes/no \
                 outcome, the units are independent of each other (no repeated visits by the \
                 same person counted twice, no clusters), and if the groups did not differ, any \
                 relabelling of the units would have been as likely as the one observed (as \
                 under random assignment). The test holds the total number of yes answers fixed \
                 (Fisher's exact test), which makes it somewhat conservative."
                .into(),
            DesignKey::Estimate | DesignKey::Plan => "The bootstrap treats the observations as \
                 independent draws from the population of interest (pairs as units for paired \
                 data and associations, each stratum on its own where strata are given); it \
                 cannot correct for a biased or clustered sample."
                .into(),
        },
        Caution::SmallSample { smallest } => match design {
            DesignKey::TwoGroups => format!(
                "Small sample: the smallest group has {smallest} values. Bootstrap intervals \
                 tend to be too narrow for samples this small (percentile intervals most of all; \
                 Hesterberg 2015), and a permutation test has little power."
            ),
            DesignKey::Paired | DesignKey::OneSample => format!(
                "Small sample ({smallest} differences): the test has little power, and \
                 bootstrap intervals tend to be too narrow for samples this small (Hesterberg \
                 2015)."
            ),
            DesignKey::Association => format!(
                "Small sample ({smallest} pairs): the estimate is unstable and bootstrap \
                 intervals tend to be too narrow (Hesterberg 2015)."
            ),
            DesignKey::KGroups => format!(
                "Small groups: the smallest has {smallest} values. A permutation test then has \
                 little power, and bootstrap intervals tend to be too narrow (Hesterberg 2015)."
            ),
            _ => format!(
                "Small sample ({smallest}): bootstrap intervals tend to be too narrow for \
                 samples this small — the percentile interval most of all (Hesterberg 2015); \
                 prefer BCa or studentized and read the interval as rough."
            ),
        },
        Caution::UnequalSpreads { ratio } => match design {
            DesignKey::KGroups => format!(
                "The spreads differ (largest SD {} times the smallest) and the groups have \
                 different sizes: relabelling the F statistic then also reacts to the unequal \
                 spread. The Welch F statistic is the safer choice here.",
                fmt::sig(*ratio)
            ),
            _ => format!(
                "The spreads differ (SD ratio {}) and the groups have different sizes: a \
                 relabelling test of a difference in means then also reacts to the unequal \
                 spread. The Welch t statistic is the safer choice here (Chung & Romano 2013).",
                fmt::sig(*ratio)
            ),
        },
        Caution::UnequalSpreadsRanks { ratio } => format!(
            "The spreads differ (SD ratio {}) and the groups have different sizes: relabelling \
             the rank-sum statistic then reacts to the unequal spread as well as to a shift, so \
             a small p-value alone does not show a probability of superiority other than one \
             half (Pratt 1964); read it as evidence that the distributions differ.",
            fmt::sig(*ratio)
        ),
        Caution::NotCausation => match design {
            DesignKey::Estimate => "Correlation is not causation, and r and the slope describe \
                 only the straight-line part of an association."
                .into(),
            _ => "Correlation is not causation: a third variable, or the way the units were \
                 chosen, can produce an association. r and the slope describe only the \
                 straight-line part of a relation; look at the scatter plot."
                .into(),
        },
        Caution::FollowUps => "The omnibus test says whether the groups differ somewhere, not \
             where; the follow-up comparisons say where. Holm's adjustment keeps the chance of \
             any false positive among them at 5% (family-wise error); Benjamini–Hochberg keeps \
             the expected share of false positives among the comparisons called significant at \
             5% (false discovery rate), and finds more when many comparisons are made. Decide \
             which comparisons you planned before looking at the data: picking comparisons \
             after seeing the results needs adjustment over every comparison you could have \
             made."
            .into(),
        Caution::EtaOverstates => "Eta squared from a sample overstates the share of variation \
             in the population, most for small groups; omega squared corrects for this."
            .into(),
        Caution::StrataMatter => "Why the strata matter: when the strata differ in level and \
             the groups are spread unevenly over them, a comparison that ignores the strata \
             mixes the difference between the groups with the difference between the strata, \
             and can even reverse its sign (Simpson's paradox). Comparing within strata removes \
             the strata's own effect."
            .into(),
        Caution::StrataWeighting { weights } => format!(
            "The stratum differences are averaged {}; the other weighting answers a slightly \
             different question when the difference varies between strata. Look at the \
             per-stratum differences: if they point in different directions, one average hides \
             that.",
            strata_weights(*weights)
        ),
        Caution::SmallStrata { smallest } => format!(
            "Small strata: some stratum has only {smallest} value{} in a group. Such strata \
             contribute little information, and bootstrap intervals can be too narrow.",
            plural(*smallest)
        ),
        Caution::SmallExpected { smallest } => format!(
            "The smallest expected count is {}, below 5: the chi-square test's p-value is not \
             reliable here (common practice); rely on the exact test.",
            fmt::sig(*smallest)
        ),
        Caution::SmallGroupsForProportions { smallest } => format!(
            "Small groups (the smaller has {smallest} units): intervals for proportions are wide \
             and bootstrap intervals can be too narrow; the Newcombe interval behaves better."
        ),
        Caution::MeasuresDiffer => "The difference in proportions, the risk ratio and the odds \
             ratio answer different questions; the odds ratio is far from the risk ratio when \
             yes answers are common. Report the one that fits the decision, with the group \
             proportions."
            .into(),
        Caution::SimultaneousIntervals => "Several intervals on the same data do not all hold at \
             once with the stated confidence; adjust the level if they are read together."
            .into(),
        Caution::PValueNotEffect => "A p-value says how unusual the observed result would be if \
             there were no effect; it is not the size or the importance of the effect. Read it \
             together with the interval."
            .into(),
        Caution::Multiplicity => "Several tests on the same data: some small p-values arise by \
             chance alone. If this is one of several comparisons, adjust for their number (for \
             example Holm's method)."
            .into(),
        Caution::Decisions => "Clinical, safety or regulatory decisions need a qualified \
             statistician and the guidelines that apply to them; this result alone is not \
             enough."
            .into(),
        Caution::PilotIsNoisy => "A pilot's spread and any effect read from a pilot are noisy \
             guesses from a small sample; planning on them often overstates power. Consider a \
             smaller effect that would still matter, and plan for that."
            .into(),
        Caution::AssumedEffect => "The plan is only as good as the assumed effect and spread: \
             take them from earlier studies or from the smallest effect that would matter, not \
             from the hoped-for result."
            .into(),
        Caution::RunAsPlanned => "The plan holds only if the study is run as assumed: the same \
             design, test and significance level, independent units, and no losses. Add units \
             for expected dropout or missing outcomes."
            .into(),
        Caution::PlanMultiplicity => "Several primary outcomes or comparisons need adjustment \
             for multiple testing, which lowers the power of each; plan for the adjusted level."
            .into(),
        Caution::PlanDecisions => "Sample sizes for clinical, safety or regulatory studies must \
             be set with a qualified statistician and the guidelines that apply to them."
            .into(),
    }
}

/// Every caution of a report, worded for its design.
pub fn cautions(cs: &[crate::designs::Caution], design: crate::designs::DesignKey) -> Vec<String> {
    cs.iter().map(|c| caution(c, design)).collect()
}
