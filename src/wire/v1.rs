//! The reader for format version 1: saved analyses and share links made before the engine
//! took one settings block for every design. Its request types are frozen copies of the
//! version-1 format and are only ever read; each converts into today's job with the same
//! numbers (the fixtures in `tests/fixtures/v1` check that bit for bit).

use serde::Deserialize;
use serde_json::Value;

use super::Job;
use crate::base::{Alternative, Error, ErrorKind, IntervalMethod, Side, TwoSidedRule};
use crate::designs::estimate::{Estimate, EstimateLayout, EstimateRequest};
use crate::designs::k_groups::{KGroupsRequest, KStatistic};
use crate::designs::one_sample::OneSampleRequest;
use crate::designs::paired::{FlipStatistic, PairedLayout, PairedRequest};
use crate::designs::plan::{PlanDesign, PlanModel, PlanRequest};
use crate::designs::stratified::{StrataRequest, StrataWeights};
use crate::designs::two_groups::{Statistic, TwoGroupsRequest};
use crate::designs::yes_no::{YesNoInput, YesNoRequest, YesNoStatistic};
use crate::designs::{association::AssocRequest, association::AssocStatistic, TestSettings};
use crate::input::columns::Layout;
use crate::input::table::HeaderChoice;

/// A version-1 job: `{"job": "compare", "request": {…, "format_version": 1}}`.
#[derive(Deserialize)]
#[serde(tag = "job", content = "request", rename_all = "kebab-case")]
enum V1Job {
    Compare(Compare),
    Estimate(Estimate1),
    Paired(Paired1),
    Association(Assoc1),
    KGroups(KGroups1),
    Stratified(Strata1),
    YesNo(YesNo1),
    Plan(Plan1),
}

/// The shared settings block of the version-1 k-group, stratified and yes/no requests.
#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Settings1 {
    alternative: Alternative,
    #[serde(default)]
    two_sided: TwoSidedRule,
    resamples: u64,
    exact_limit: u64,
    bootstrap_resamples: u64,
    confidence: f64,
    interval: IntervalMethod,
    seed: u64,
}

impl Settings1 {
    fn into_v2(self) -> TestSettings {
        TestSettings {
            alternative: self.alternative,
            two_sided: self.two_sided,
            resamples: self.resamples,
            exact_limit: self.exact_limit,
            bootstrap_resamples: self.bootstrap_resamples,
            confidence: self.confidence,
            intervals: vec![self.interval],
            seed: self.seed,
            keep_resamples: false,
            stop_after: None,
            settle_at: None,
            // Format 1 predates generation 2 of the kernels.
            kernels: 1,
        }
    }
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Compare {
    #[allow(dead_code)]
    format_version: u32,
    data: String,
    #[serde(default)]
    header: HeaderChoice,
    layout: Layout,
    #[serde(default)]
    first: Option<String>,
    #[serde(default)]
    second: Option<String>,
    statistic: Statistic,
    alternative: Alternative,
    #[serde(default)]
    two_sided: TwoSidedRule,
    resamples: u64,
    exact_limit: u64,
    bootstrap_resamples: u64,
    confidence: f64,
    interval: IntervalMethod,
    #[serde(default)]
    more_intervals: Vec<IntervalMethod>,
    seed: u64,
    #[serde(default)]
    keep_resamples: bool,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Estimate1 {
    #[allow(dead_code)]
    format_version: u32,
    data: String,
    #[serde(default)]
    header: HeaderChoice,
    layout: EstimateLayout,
    estimate: Estimate,
    #[serde(default)]
    q: Option<f64>,
    #[serde(default)]
    methods: Vec<IntervalMethod>,
    #[serde(default)]
    side: Side,
    confidence: f64,
    resamples: u64,
    seed: u64,
    #[serde(default)]
    keep_resamples: bool,
}

#[derive(Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
enum PairedLayout1 {
    Paired {
        first: String,
        second: String,
    },
    OneSample {
        value: String,
        reference: f64,
    },
    Long {
        value: String,
        group: String,
        unit: String,
        first: String,
        second: String,
    },
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Paired1 {
    #[allow(dead_code)]
    format_version: u32,
    data: String,
    #[serde(default)]
    header: HeaderChoice,
    layout: PairedLayout1,
    statistic: FlipStatistic,
    alternative: Alternative,
    #[serde(default)]
    two_sided: TwoSidedRule,
    resamples: u64,
    exact_limit: u64,
    bootstrap_resamples: u64,
    confidence: f64,
    interval: IntervalMethod,
    seed: u64,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Assoc1 {
    #[allow(dead_code)]
    format_version: u32,
    data: String,
    #[serde(default)]
    header: HeaderChoice,
    x: String,
    y: String,
    statistic: AssocStatistic,
    alternative: Alternative,
    #[serde(default)]
    two_sided: TwoSidedRule,
    resamples: u64,
    exact_limit: u64,
    bootstrap_resamples: u64,
    confidence: f64,
    interval: IntervalMethod,
    seed: u64,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct KGroups1 {
    #[allow(dead_code)]
    format_version: u32,
    data: String,
    #[serde(default)]
    header: HeaderChoice,
    layout: Layout,
    #[serde(default)]
    control: Option<String>,
    statistic: KStatistic,
    settings: Settings1,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Strata1 {
    #[allow(dead_code)]
    format_version: u32,
    data: String,
    #[serde(default)]
    header: HeaderChoice,
    value: String,
    group: String,
    strata: String,
    #[serde(default)]
    first: Option<String>,
    #[serde(default)]
    second: Option<String>,
    #[serde(default)]
    weights: StrataWeights,
    settings: Settings1,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct YesNo1 {
    #[allow(dead_code)]
    format_version: u32,
    #[serde(default)]
    data: String,
    #[serde(default)]
    header: HeaderChoice,
    input: YesNoInput,
    statistic: YesNoStatistic,
    settings: Settings1,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Plan1 {
    #[allow(dead_code)]
    format_version: u32,
    design: PlanDesign,
    model: PlanModel,
    effect: f64,
    #[serde(default)]
    means: Vec<f64>,
    #[serde(default)]
    statistic: String,
    alpha: f64,
    alternative: Alternative,
    target_power: f64,
    studies: u64,
    relabellings: u64,
    max_n: u64,
    #[serde(default)]
    mde_n: Option<u64>,
    seed: u64,
}

/// The flat settings of the version-1 two-group, paired and association requests.
#[allow(clippy::too_many_arguments)]
fn settings(
    alternative: Alternative,
    two_sided: TwoSidedRule,
    resamples: u64,
    exact_limit: u64,
    bootstrap_resamples: u64,
    confidence: f64,
    intervals: Vec<IntervalMethod>,
    seed: u64,
    keep_resamples: bool,
) -> TestSettings {
    TestSettings {
        alternative,
        two_sided,
        resamples,
        exact_limit,
        bootstrap_resamples,
        confidence,
        intervals,
        seed,
        keep_resamples,
        stop_after: None,
        settle_at: None,
        kernels: 1,
    }
}

fn convert(job: V1Job) -> Job {
    match job {
        V1Job::Compare(r) => Job::TwoGroups(TwoGroupsRequest {
            data: r.data,
            header: r.header,
            layout: r.layout,
            first: r.first,
            second: r.second,
            statistic: r.statistic,
            robustness: false,
            settings: settings(
                r.alternative,
                r.two_sided,
                r.resamples,
                r.exact_limit,
                r.bootstrap_resamples,
                r.confidence,
                std::iter::once(r.interval)
                    .chain(r.more_intervals)
                    .collect(),
                r.seed,
                r.keep_resamples,
            ),
        }),
        V1Job::Estimate(r) => Job::Estimate(EstimateRequest {
            data: r.data,
            header: r.header,
            layout: r.layout,
            estimate: r.estimate,
            q: r.q,
            methods: r.methods,
            side: r.side,
            confidence: r.confidence,
            resamples: r.resamples,
            seed: r.seed,
            keep_resamples: r.keep_resamples,
        }),
        V1Job::Paired(r) => {
            let s = settings(
                r.alternative,
                r.two_sided,
                r.resamples,
                r.exact_limit,
                r.bootstrap_resamples,
                r.confidence,
                vec![r.interval],
                r.seed,
                false,
            );
            match r.layout {
                PairedLayout1::Paired { first, second } => Job::Paired(PairedRequest {
                    data: r.data,
                    header: r.header,
                    layout: PairedLayout::Columns { first, second },
                    statistic: r.statistic,
                    settings: s,
                }),
                PairedLayout1::Long {
                    value,
                    group,
                    unit,
                    first,
                    second,
                } => Job::Paired(PairedRequest {
                    data: r.data,
                    header: r.header,
                    layout: PairedLayout::Long {
                        value,
                        group,
                        unit,
                        first,
                        second,
                    },
                    statistic: r.statistic,
                    settings: s,
                }),
                PairedLayout1::OneSample { value, reference } => Job::OneSample(OneSampleRequest {
                    data: r.data,
                    header: r.header,
                    value,
                    reference,
                    statistic: r.statistic,
                    settings: s,
                }),
            }
        }
        V1Job::Association(r) => Job::Association(AssocRequest {
            data: r.data,
            header: r.header,
            x: r.x,
            y: r.y,
            statistic: r.statistic,
            settings: settings(
                r.alternative,
                r.two_sided,
                r.resamples,
                r.exact_limit,
                r.bootstrap_resamples,
                r.confidence,
                vec![r.interval],
                r.seed,
                false,
            ),
        }),
        V1Job::KGroups(r) => Job::KGroups(KGroupsRequest {
            data: r.data,
            header: r.header,
            layout: r.layout,
            control: r.control,
            statistic: r.statistic,
            settings: r.settings.into_v2(),
        }),
        V1Job::Stratified(r) => Job::Stratified(StrataRequest {
            data: r.data,
            header: r.header,
            value: r.value,
            group: r.group,
            strata: r.strata,
            first: r.first,
            second: r.second,
            weights: r.weights,
            settings: r.settings.into_v2(),
        }),
        V1Job::YesNo(r) => Job::YesNo(YesNoRequest {
            data: r.data,
            header: r.header,
            input: r.input,
            statistic: r.statistic,
            settings: r.settings.into_v2(),
        }),
        V1Job::Plan(r) => Job::Plan(PlanRequest {
            design: r.design,
            model: r.model,
            effect: r.effect,
            means: r.means,
            statistic: r.statistic,
            alpha: r.alpha,
            alternative: r.alternative,
            target_power: r.target_power,
            studies: r.studies,
            relabellings: r.relabellings,
            max_n: r.max_n,
            mde_n: r.mde_n,
            seed: r.seed,
        }),
    }
}

/// Reads a version-1 job (or a bare version-1 two-group request) as today's job.
pub fn read(value: Value) -> Result<Job, Error> {
    let bad = |e: serde_json::Error| {
        Error::new(
            ErrorKind::Link,
            format!("The version-1 analysis could not be read ({e})."),
        )
    };
    if value.get("job").is_some() {
        return serde_json::from_value::<V1Job>(value)
            .map(convert)
            .map_err(bad);
    }
    serde_json::from_value::<Compare>(value)
        .map(|r| convert(V1Job::Compare(r)))
        .map_err(bad)
}
