//! Notes as typed codes: what was left out, read specially or needs care. Every layer that
//! notices something records a code with its data; `render::words` words each code once, so
//! the page, the command and the reports say the same thing.

use serde::{Deserialize, Serialize};

/// Something a report or an interval says about how it was computed.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "code", rename_all = "kebab-case")]
pub enum Note {
    // ----- reading the table ---------------------------------------------------------
    /// Blank or NA cells of a column were left out.
    MissingCells {
        /// The column.
        column: String,
        /// How many cells.
        count: usize,
    },
    /// Cells holding a spreadsheet's error value (#N/A, #DIV/0!, ...) were left out as missing.
    SpreadsheetErrors {
        /// The column.
        column: String,
        /// How many cells.
        count: usize,
        /// (line, text) of the first few.
        cells: Vec<(u64, String)>,
    },
    /// Every value shares an offset that dwarfs the spread; the values were analysed as
    /// differences from it (centres and ranges shown add it back).
    ValuesShifted {
        /// The offset.
        by: f64,
    },
    /// Values with more significant digits than a double keeps (17) were rounded to the
    /// nearest double.
    DigitsBeyondDouble {
        /// The column.
        column: String,
        /// How many values.
        count: usize,
        /// The line of the first.
        line: u64,
        /// The first as typed (shortened).
        text: String,
    },
    /// The comment block before the table (lines starting with '#') was skipped.
    CommentLinesSkipped {
        /// How many lines.
        count: usize,
    },
    /// Values with a decimal comma were read as decimal points.
    DecimalCommas {
        /// The column.
        column: String,
        /// How many values.
        count: usize,
    },
    /// Values without a group label were left out.
    Unlabelled {
        /// The label column.
        column: String,
        /// How many values.
        count: usize,
        /// The lines of the first few (empty when not known).
        lines: Vec<u64>,
    },
    /// Only two of the groups of a label column are compared.
    OtherGroupsLeftOut {
        /// The first group compared.
        first: String,
        /// The second group compared.
        second: String,
        /// The groups left out.
        others: Vec<String>,
    },
    /// Rows with a value in only one of two columns were left out.
    IncompleteRows {
        /// The first column.
        first: String,
        /// The second column.
        second: String,
        /// How many rows.
        count: usize,
    },
    /// Pairs with a missing member were left out.
    IncompletePairs {
        /// How many pairs.
        count: usize,
        /// The two columns and how many values each has, when they differ in length.
        lengths: Option<(String, usize, String, usize)>,
    },
    /// Rows without a unit were left out (paired data in long format).
    NoUnit {
        /// The unit column.
        column: String,
        /// How many rows.
        count: usize,
    },
    /// Units with only one of the two measurements were left out.
    IncompleteUnits {
        /// How many units.
        count: usize,
    },
    /// Rows without a stratum were left out.
    NoStratum {
        /// The stratum column.
        column: String,
        /// How many rows.
        count: usize,
        /// The lines of the first few.
        lines: Vec<u64>,
    },
    /// Strata holding only one of the two groups were left out.
    PartialStrata {
        /// Their names.
        names: Vec<String>,
        /// How many rows they held.
        rows: usize,
    },
    /// The bootstrap resampled within strata.
    WithinStrata {
        /// The stratum column.
        column: String,
        /// How many strata.
        strata: usize,
    },

    // ----- the test -----------------------------------------------------------------
    /// Relabellings gave an infinite statistic (counted, not plotted).
    InfiniteStatistics {
        /// How many relabellings.
        count: u64,
        /// Why: identical values in both groups (a t statistic), or a group without spread
        /// (an F statistic).
        cause: InfiniteCause,
    },
    /// The ratio statistic of a yes/no comparison is 0 or infinite: a group has no yes (or
    /// no no) answers.
    RatioAtLimit {
        /// The statistic's key ("risk-ratio", "odds-ratio").
        statistic: String,
        /// Its value (0 or infinity).
        #[serde(with = "super::floats::float")]
        value: f64,
    },
    /// Only the first values of a long run are kept for the download.
    KeptValuesCapped {
        /// How many are kept.
        kept: u64,
    },

    // ----- the bootstrap --------------------------------------------------------------
    /// BCa with fewer than 2,000 resamples.
    FewResamplesForBca,
    /// Fewer bootstrap resamples were used than asked for (memory).
    ResamplesCapped {
        /// Asked for.
        asked: u64,
        /// Used.
        used: u64,
        /// Whether a nested bootstrap set the cap.
        nested: bool,
    },
    /// The studentized interval used a nested bootstrap for the standard error.
    NestedBootstrap {
        /// Inner resamples per resample.
        inner: usize,
    },
    /// Resamples gave no defined value and were left out.
    UndefinedResamples {
        /// How many.
        count: u64,
        /// Out of how many (0 when not stated).
        total: u64,
    },
    /// Resamples without spread in either group were left out (Hedges' g).
    NoSpreadResamples {
        /// How many.
        count: u64,
    },
    /// The estimate lies at the edge of its possible range.
    EstimateAtEdge {
        /// The estimate.
        estimate: f64,
    },
    /// Too few observations lie beyond a quantile for its interval.
    FewBeyondQuantile {
        /// About how many lie beyond it.
        tail: f64,
        /// The quantile (0.9 for the 90th percentile).
        q: f64,
        /// Distinct values in the sample.
        distinct: usize,
    },
    /// The bootstrap SE of a ratio exceeds the ratio.
    UnstableRatio,

    /// Tied values share a mid-rank: the rank statistic's null distribution is that of the
    /// mid-ranks, not the tie-free tables.
    TiedRanks {
        /// Values that share their value with another.
        values: usize,
        /// In how many groups of equal values.
        groups: usize,
    },
    /// Relabellings and/or bootstrap resamples of a large sample were drawn by the streaming
    /// kernels of generation 2.
    StreamingKernels {
        /// The values analysed.
        values: usize,
        /// Whether the random relabellings streamed.
        relabelling: bool,
        /// Whether the bootstrap resamples streamed.
        bootstrap: bool,
    },

    // ----- intervals ----------------------------------------------------------------
    /// The estimate itself is not a finite number.
    EstimateNotFinite,
    /// No bootstrap resample gave a defined value.
    NoDefinedResample,
    /// Every resample gave the same value: no interval by this method.
    NoVariation,
    /// Every resample gave the same value: a zero-width interval.
    ZeroWidth,
    /// Every bootstrap value lies on one side of the estimate (BCa undefined).
    AllOnOneSide,
    /// The jackknife values did not vary: acceleration taken as 0.
    AccelerationZero,
    /// The acceleration came from a grouped jackknife.
    GroupedJackknife {
        /// How many groups.
        groups: usize,
    },
    /// The BCa limits fell in the outermost bootstrap values.
    BcaAtExtremes,
    /// No standard error is available for a studentized interval.
    NoStandardError,
    /// Too few resamples had a positive standard error.
    TooFewStandardErrors,
    /// Resamples with zero standard error were left out of the t values.
    ZeroStandardErrors {
        /// How many.
        count: usize,
    },
    /// The limits were clipped to the possible range.
    Clipped {
        /// The lowest possible value.
        low: f64,
        /// The highest possible value.
        #[serde(with = "super::floats::float")]
        high: f64,
    },
    /// Hedges' g is undefined: neither group varies.
    HedgesUndefined,
    /// d_z is undefined: the differences do not vary.
    DifferencesConstant,
    /// The Fisher z interval needs at least 4 pairs and |r| < 1.
    FisherZNeedsMore,
    /// Welch's t-test is undefined: neither group varies.
    WelchUndefined,
    /// The t-test is undefined: the differences do not vary.
    TTestUndefined,
    /// The linear model is undefined.
    LinearModelUndefined,
    /// An interval of a 2×2 table is undefined with a zero count.
    ZeroCount,

    // ----- planning ----------------------------------------------------------------
    /// The assumed effect is no effect at all.
    NoEffectAssumed,
    /// The largest size tried did not reach the target power.
    TargetNotReached {
        /// The largest size tried.
        max_n: u64,
        /// Whether sizes count pairs (otherwise units per group).
        pairs: bool,
        /// The target power.
        target: f64,
    },
    /// Too few units for a detectable-effect search.
    TooFewForDetectable {
        /// The least size the search needs.
        min_n: u64,
        /// The size asked for.
        n: u64,
        /// Whether sizes count pairs.
        pairs: bool,
    },
}

/// Why a relabelling gave an infinite statistic.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum InfiniteCause {
    /// Only identical values in both groups: an infinite t.
    IdenticalValues,
    /// A group without spread: an infinite F.
    NoSpreadInAGroup,
}
