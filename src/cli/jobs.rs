//! The options of `analyze`, `estimate` and `plan`, and the job each command line describes.

use clap::{Args, ValueEnum};

use super::args::{self, HeaderArg, Outputs, SideArg, TestArgs};
use super::{fresh_seed, read_data};
use crate::base::{Alternative, Error, ErrorKind};
use crate::designs::association::{AssocRequest, AssocStatistic};
use crate::designs::estimate::{Estimate, EstimateLayout, EstimateRequest};
use crate::designs::k_groups::{KGroupsRequest, KStatistic};
use crate::designs::one_sample::OneSampleRequest;
use crate::designs::paired::{sign_flip_settings, FlipStatistic, PairedLayout, PairedRequest};
use crate::designs::plan::{PlanDesign, PlanModel, PlanRequest};
use crate::designs::stratified::{StrataRequest, StrataWeights};
use crate::designs::two_groups::{Statistic, TwoGroupsRequest};
use crate::designs::yes_no::{parse_counts, YesNoInput, YesNoRequest, YesNoStatistic};
use crate::designs::TestSettings;
use crate::input::columns::Layout;
use crate::wire::{self, Job};

/// The designs `analyze` runs.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum DesignArg {
    /// Two independent groups.
    TwoGroups,
    /// Each unit measured twice.
    Paired,
    /// One sample against a reference value.
    OneSample,
    /// Two numeric columns.
    Association,
    /// Three or more groups.
    KGroups,
    /// Two groups within strata.
    Stratified,
    /// Yes/no outcomes in two groups.
    YesNo,
}

/// How stratum differences are averaged.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum WeightsArg {
    /// By stratum size.
    Size,
    /// By n1·n2/(n1 + n2).
    Precision,
}

/// `reshuffle analyze`.
#[derive(Args, Debug, Clone)]
#[command(
    after_help = "Statistics by design: two groups: mean-difference (default), \
    median-difference, trimmed-mean-difference, welch-t, rank-sum, ks-distance, log-sd-ratio, log-mad-ratio; paired and one-sample: mean, median, \
    signed-rank; association: pearson, spearman, slope, kendall; k groups: f, welch-f, median-spread; yes/no: \
    proportion-difference, risk-ratio, odds-ratio."
)]
pub struct AnalyzeArgs {
    /// The data file (`-` for standard input).
    pub file: Option<String>,
    /// The design (default: two groups).
    #[arg(long, value_enum, default_value = "two-groups")]
    pub design: DesignArg,
    /// Long format: the numeric column (or the yes/no outcome column).
    #[arg(long, value_name = "COL")]
    pub value: Option<String>,
    /// Long format: the column of group labels (or of measurements, for paired data).
    #[arg(long, value_name = "COL")]
    pub group: Option<String>,
    /// Wide format: one column per group (or per measurement, for paired data).
    #[arg(long, value_name = "A,B", value_parser = args::names)]
    pub columns: Option<::std::vec::Vec<String>>,
    /// The group that comes first (the statistic is first minus second).
    #[arg(long, value_name = "LEVEL")]
    pub first: Option<String>,
    /// With more than two labels: the other group to compare.
    #[arg(long, value_name = "LEVEL")]
    pub second: Option<String>,
    /// Paired data in long format: the column naming each unit.
    #[arg(long, value_name = "COL")]
    pub unit: Option<String>,
    /// One sample: the reference value.
    #[arg(long, value_name = "VALUE", allow_hyphen_values = true, value_parser = args::number)]
    pub reference: Option<f64>,
    /// Association: the x column.
    #[arg(long, value_name = "COL")]
    pub x: Option<String>,
    /// Association: the y column.
    #[arg(long, value_name = "COL")]
    pub y: Option<String>,
    /// Stratified: the column naming each row's stratum (site, batch, day).
    #[arg(long, value_name = "COL")]
    pub strata: Option<String>,
    /// Stratified: how the stratum differences are averaged.
    #[arg(long, value_enum)]
    pub weights: Option<WeightsArg>,
    /// k groups: compare each group with this one only.
    #[arg(long, value_name = "LEVEL")]
    pub control: Option<String>,
    /// Yes/no: counts typed in, "42/300,61/310" or "old: 42/300; new: 61/310".
    #[arg(long, value_name = "COUNTS")]
    pub counts: Option<String>,
    /// The test statistic (see below for each design).
    #[arg(long, value_name = "KEY")]
    pub statistic: Option<String>,
    /// Continue a saved analysis (--link or --request) with N more relabellings (or sign
    /// patterns, pairings): the next blocks of the same seed, so the earlier ones are kept
    /// and the report and link record the total.
    #[arg(long, value_name = "N", value_parser = args::more)]
    pub more: Option<u64>,
    /// Continue a saved analysis with N more bootstrap resamples (the next ones of the seed).
    #[arg(long, value_name = "N", value_parser = args::more)]
    pub more_bootstrap: Option<u64>,
    /// Two groups: also answer with the other statistics (mean, median and trimmed-mean
    /// differences, Welch t, rank-sum) and the percentile and BCa intervals, side by side.
    #[arg(long)]
    pub robustness: bool,
    /// The test and interval settings.
    #[command(flatten)]
    pub test: TestArgs,
    /// Re-run the analysis in a share link.
    #[arg(long, value_name = "URL", conflicts_with_all = ["file", "request", "counts"])]
    pub link: Option<String>,
    /// Re-run a saved analysis file.
    #[arg(long, value_name = "FILE.json", conflicts_with_all = ["file", "counts"])]
    pub request: Option<String>,
    /// Where the findings go.
    #[command(flatten)]
    pub outputs: Outputs,
}

fn need<T>(v: Option<T>, message: &str) -> Result<T, Error> {
    v.ok_or_else(|| Error::settings(message))
}

fn statistic<T>(
    key: &Option<String>,
    from: impl Fn(&str) -> Option<T>,
    default: T,
    allowed: &str,
) -> Result<T, Error> {
    match key {
        None => Ok(default),
        Some(k) => from(k).ok_or_else(|| {
            Error::settings(format!(
                "--statistic takes {allowed} for this design, not \"{k}\"."
            ))
        }),
    }
}

impl AnalyzeArgs {
    fn data(&self) -> Result<String, Error> {
        read_data(need(
            self.file.as_deref(),
            "Name the data file (or - for standard input).",
        )?)
    }

    fn settings(&self, base: TestSettings) -> TestSettings {
        let mut s = base;
        self.test.apply(&mut s, fresh_seed());
        s
    }

    fn layout(&self) -> Result<Layout, Error> {
        match (&self.value, &self.group, &self.columns) {
            (None, None, None) => Ok(Layout::Detect),
            (Some(value), Some(group), None) => Ok(Layout::Long {
                value: value.clone(),
                group: group.clone(),
            }),
            (None, None, Some(columns)) => Ok(Layout::Wide {
                columns: columns.clone(),
            }),
            (Some(_), None, None) | (None, Some(_), None) => Err(Error::settings(
                "Long format needs both --value and --group.",
            )),
            _ => Err(Error::settings(
                "Use either --value with --group (long format) or --columns (wide format), not \
                 both.",
            )),
        }
    }

    /// The job this command line describes.
    pub fn job(&self) -> Result<Job, Error> {
        let saved = if let Some(l) = &self.link {
            let d = wire::link::decode(l)?;
            if !d.checked {
                eprintln!("reshuffle: note: {}", crate::render::words::UNCHECKED_LINK);
            }
            Some(d.job)
        } else if let Some(f) = &self.request {
            Some(
                wire::read_job(&read_data(f)?)
                    .map_err(|e| Error::new(e.kind, format!("\"{f}\": {}", e.message)))?
                    .job,
            )
        } else {
            None
        };
        // A saved analysis keeps its settings; --robustness adds the table to two groups,
        // --more and --more-bootstrap continue its run.
        if let Some(mut job) = saved {
            if self.more.is_some() || self.more_bootstrap.is_some() {
                let Some(set) = job.test_settings() else {
                    return Err(Error::settings(
                        "--more and --more-bootstrap continue a test; this saved analysis \
                         has none (an estimate or a plan: raise its resamples instead).",
                    ));
                };
                set.continue_with(self.more.unwrap_or(0), self.more_bootstrap.unwrap_or(0))?;
            }
            match (&mut job, self.robustness) {
                (_, false) => {}
                (Job::TwoGroups(r), true) => r.robustness = true,
                (_, true) => {
                    return Err(Error::settings(
                        "--robustness compares the statistics of two groups; this saved \
                         analysis has another design.",
                    ))
                }
            }
            return Ok(job);
        }
        let header = self.test.header.into();
        if self.more.is_some() || self.more_bootstrap.is_some() {
            return Err(Error::settings(
                "--more and --more-bootstrap continue a saved analysis (--link or --request); \
                 for a new one, set --resamples and --bootstrap.",
            ));
        }
        if self.robustness && !matches!(self.design, DesignArg::TwoGroups) {
            return Err(Error::settings(
                "--robustness compares the statistics of two groups; leave it out for this \
                 design.",
            ));
        }
        Ok(match self.design {
            DesignArg::TwoGroups => {
                let mut r = TwoGroupsRequest::new(self.data()?, 0);
                r.header = header;
                r.layout = self.layout()?;
                (r.first, r.second) = (self.first.clone(), self.second.clone());
                r.statistic = statistic(
                    &self.statistic,
                    Statistic::from_key,
                    Statistic::MeanDifference,
                    "mean-difference, median-difference, trimmed-mean-difference, welch-t, rank-sum, ks-distance, log-sd-ratio or log-mad-ratio",
                )?;
                r.robustness = self.robustness;
                r.settings = self.settings(TestSettings::new(0));
                Job::TwoGroups(r)
            }
            DesignArg::Paired => {
                let layout =
                    match (&self.columns, &self.value, &self.group, &self.unit) {
                        (Some(c), None, None, None) if c.len() == 2 => PairedLayout::Columns {
                            first: c[0].clone(),
                            second: c[1].clone(),
                        },
                        (None, Some(v), Some(g), Some(u)) => PairedLayout::Long {
                            value: v.clone(),
                            group: g.clone(),
                            unit: u.clone(),
                            first: self.first.clone().unwrap_or_default(),
                            second: self.second.clone().unwrap_or_default(),
                        },
                        _ => return Err(Error::settings(
                            "The paired design needs --columns FIRST,SECOND (the difference is \
                             first minus second), or --value COL --group COL --unit COL in long \
                             format.",
                        )),
                    };
                let mut r = PairedRequest::new(self.data()?, layout, 0);
                r.header = header;
                r.statistic = statistic(
                    &self.statistic,
                    FlipStatistic::from_key,
                    FlipStatistic::Mean,
                    "mean, median or signed-rank",
                )?;
                r.settings = self.settings(sign_flip_settings(0));
                Job::Paired(r)
            }
            DesignArg::OneSample => {
                let (Some(value), Some(reference)) = (&self.value, self.reference) else {
                    return Err(Error::settings(
                        "The one-sample design needs --value COL and --reference VALUE.",
                    ));
                };
                let mut r = OneSampleRequest::new(self.data()?, value.clone(), reference, 0);
                r.header = header;
                r.statistic = statistic(
                    &self.statistic,
                    FlipStatistic::from_key,
                    FlipStatistic::Mean,
                    "mean, median or signed-rank",
                )?;
                r.settings = self.settings(sign_flip_settings(0));
                Job::OneSample(r)
            }
            DesignArg::Association => {
                let (Some(x), Some(y)) = (&self.x, &self.y) else {
                    return Err(Error::settings(
                        "The association design needs --x COL and --y COL.",
                    ));
                };
                let mut r = AssocRequest::new(self.data()?, x.clone(), y.clone(), 0);
                r.header = header;
                r.statistic = statistic(
                    &self.statistic,
                    AssocStatistic::from_key,
                    AssocStatistic::Pearson,
                    "pearson, spearman, slope or kendall",
                )?;
                r.settings = self.settings(TestSettings::new(0));
                Job::Association(r)
            }
            DesignArg::KGroups => {
                let mut r = KGroupsRequest::new(self.data()?, self.layout()?, 0);
                r.header = header;
                r.control = self.control.clone();
                r.statistic = statistic(
                    &self.statistic,
                    KStatistic::from_key,
                    KStatistic::F,
                    "f, welch-f or median-spread",
                )?;
                r.settings = self.settings(TestSettings::new(0));
                Job::KGroups(r)
            }
            DesignArg::Stratified => {
                let (Some(v), Some(g), Some(s)) = (&self.value, &self.group, &self.strata) else {
                    return Err(Error::settings(
                        "The stratified design needs --value COL, --group COL and --strata COL \
                         (the column naming each row's site, batch or day).",
                    ));
                };
                if let Some(st) = &self.statistic {
                    if st != "mean-difference" {
                        return Err(Error::settings(format!(
                            "The stratified design measures the difference in means within \
                             strata (--statistic mean-difference), not \"{st}\"."
                        )));
                    }
                }
                let mut r = StrataRequest::new(self.data()?, v.clone(), g.clone(), s.clone(), 0);
                r.header = header;
                (r.first, r.second) = (self.first.clone(), self.second.clone());
                r.weights = match self.weights {
                    Some(WeightsArg::Precision) => StrataWeights::Precision,
                    _ => StrataWeights::Size,
                };
                r.settings = self.settings(TestSettings::new(0));
                Job::Stratified(r)
            }
            DesignArg::YesNo => {
                let input = match (&self.counts, &self.value, &self.group) {
                    (Some(c), None, None) => YesNoInput::Counts {
                        groups: parse_counts(c).map_err(|m| Error::new(ErrorKind::Value, m))?,
                    },
                    (None, Some(value), Some(group)) => YesNoInput::Table {
                        value: value.clone(),
                        group: group.clone(),
                        first: self.first.clone(),
                        second: self.second.clone(),
                    },
                    _ => {
                        return Err(Error::settings(
                            "The yes-no design needs --value COL --group COL (a column of \
                             yes/no outcomes and a column of group labels) or --counts \
                             42/300,61/310.",
                        ))
                    }
                };
                let data = if matches!(input, YesNoInput::Counts { .. }) && self.file.is_none() {
                    String::new()
                } else {
                    self.data()?
                };
                let mut r = YesNoRequest::new(data, input, 0);
                r.header = header;
                r.statistic = statistic(
                    &self.statistic,
                    YesNoStatistic::from_key,
                    YesNoStatistic::ProportionDifference,
                    "proportion-difference, risk-ratio or odds-ratio",
                )?;
                r.settings = self.settings(TestSettings::new(0));
                Job::YesNo(r)
            }
        })
    }
}

/// `reshuffle estimate`.
#[derive(Args, Debug, Clone)]
pub struct EstimateArgs {
    /// The data file (`-` for standard input).
    pub file: String,
    /// What to estimate.
    #[arg(long, value_name = "KEY", value_parser = estimate_key)]
    pub estimate: Estimate,
    /// One sample, or two groups with --group: the numeric column.
    #[arg(long, value_name = "COL")]
    pub value: Option<String>,
    /// Two groups in long format: the column of group labels.
    #[arg(long, value_name = "COL")]
    pub group: Option<String>,
    /// Two groups in wide format: one column per group.
    #[arg(long, value_name = "A,B", value_parser = args::names)]
    pub columns: Option<::std::vec::Vec<String>>,
    /// Two columns as pairs (association): x.
    #[arg(long, value_name = "COL")]
    pub x: Option<String>,
    /// Two columns as pairs (association): y.
    #[arg(long, value_name = "COL")]
    pub y: Option<String>,
    /// One sample: resample within the strata of this column.
    #[arg(long, value_name = "COL")]
    pub strata: Option<String>,
    /// Two columns measured on the same units: resample whole rows.
    #[arg(long)]
    pub paired: bool,
    /// The group that comes first.
    #[arg(long, value_name = "LEVEL")]
    pub first: Option<String>,
    /// The other group, with more than two labels.
    #[arg(long, value_name = "LEVEL")]
    pub second: Option<String>,
    /// The quantile, for --estimate quantile (0.9 for the 90th percentile).
    #[arg(long, value_name = "Q", value_parser = args::number)]
    pub q: Option<f64>,
    /// percentile, basic, normal, bca (default), studentized, a list, or all.
    #[arg(long, value_name = "METHODS", value_parser = args::intervals)]
    pub interval: Option<::std::vec::Vec<crate::base::IntervalMethod>>,
    /// A two-sided interval or a one-sided bound.
    #[arg(long, value_enum, default_value = "two-sided")]
    pub side: SideArg,
    /// Confidence level (default 0.95).
    #[arg(long, value_name = "C", value_parser = args::confidence)]
    pub confidence: Option<f64>,
    /// Bootstrap resamples (default 10000).
    #[arg(long, value_name = "N", value_parser = args::bootstrap)]
    pub resamples: Option<u64>,
    /// Seed (default: a fresh one).
    #[arg(long, value_name = "S", value_parser = args::seed)]
    pub seed: Option<u64>,
    /// Whether the first row holds column names.
    #[arg(long, value_enum, default_value = "detect")]
    pub header: HeaderArg,
    /// Where the findings go.
    #[command(flatten)]
    pub outputs: Outputs,
}

fn estimate_key(s: &str) -> Result<Estimate, String> {
    Estimate::from_key(s).ok_or_else(|| {
        format!(
            "one of {}, not \"{s}\"",
            Estimate::ALL.map(|e| e.key()).join(", ")
        )
    })
}

impl EstimateArgs {
    /// The job this command line describes.
    pub fn job(&self) -> Result<Job, Error> {
        let layout = match (&self.value, &self.group, &self.columns, &self.x, &self.y) {
            (Some(v), None, None, None, None) => EstimateLayout::One {
                value: v.clone(),
                strata: self.strata.clone(),
            },
            (Some(v), Some(g), None, None, None) => EstimateLayout::Groups {
                layout: Layout::Long {
                    value: v.clone(),
                    group: g.clone(),
                },
                first: self.first.clone(),
                second: self.second.clone(),
                paired: self.paired,
            },
            (None, None, Some(c), None, None) => EstimateLayout::Groups {
                layout: Layout::Wide { columns: c.clone() },
                first: self.first.clone(),
                second: self.second.clone(),
                paired: self.paired,
            },
            (None, None, None, Some(x), Some(y)) => EstimateLayout::Pairs {
                x: x.clone(),
                y: y.clone(),
            },
            _ => {
                return Err(Error::settings(
                    "Give the data as --value COL (one sample), --value COL --group COL or \
                     --columns A,B (two groups), or --x COL --y COL (association).",
                ))
            }
        };
        let mut r = EstimateRequest::new(
            read_data(&self.file)?,
            layout,
            self.estimate,
            self.seed.unwrap_or_else(fresh_seed),
        );
        r.header = self.header.into();
        r.q = self.q;
        if let Some(m) = &self.interval {
            r.methods = m.clone();
        }
        r.side = self.side.into();
        r.confidence = self.confidence.unwrap_or(r.confidence);
        r.resamples = self.resamples.unwrap_or(r.resamples);
        Ok(Job::Estimate(r))
    }
}

/// The designs a plan is for.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum PlanDesignArg {
    /// Two independent groups.
    TwoGroups,
    /// Paired measurements.
    Paired,
    /// Three or more groups.
    KGroups,
    /// Yes/no outcomes.
    YesNo,
}

/// `reshuffle plan`.
#[derive(Args, Debug, Clone)]
pub struct PlanArgs {
    /// A pilot data file, with --value.
    pub file: Option<String>,
    /// The design of the planned study.
    #[arg(long, value_enum)]
    pub design: PlanDesignArg,
    /// The assumed effect: difference in means (or ratio with --multiply, or rate
    /// difference; for k groups a factor on --means).
    #[arg(long, value_name = "E", allow_hyphen_values = true, value_parser = args::number)]
    pub effect: f64,
    /// Normal values with this standard deviation (of the differences, for pairs).
    #[arg(long, value_name = "SD", value_parser = args::number)]
    pub sd: Option<f64>,
    /// Yes/no outcomes: the yes rate of the reference group.
    #[arg(long, value_name = "RATE", value_parser = args::number)]
    pub baseline: Option<f64>,
    /// Values resampled from this pilot column of FILE.
    #[arg(long, value_name = "COL")]
    pub value: Option<String>,
    /// With a pilot: the effect is a ratio multiplying the treated group's values.
    #[arg(long)]
    pub multiply: bool,
    /// k groups: the assumed group means, e.g. 0,0,0.5.
    #[arg(long, value_name = "M,M,M", allow_hyphen_values = true, value_parser = args::numbers)]
    pub means: Option<::std::vec::Vec<f64>>,
    /// The test statistic, as in analyze.
    #[arg(long, value_name = "KEY")]
    pub statistic: Option<String>,
    /// Significance level (default 0.05).
    #[arg(long, value_name = "ALPHA", value_parser = args::number)]
    pub alpha: Option<f64>,
    /// two-sided (default), greater (treated higher) or less.
    #[arg(long, value_enum)]
    pub alternative: Option<args::AltArg>,
    /// Target power (default 0.8).
    #[arg(long, value_name = "P", value_parser = args::number)]
    pub power: Option<f64>,
    /// Simulated studies per sample size (default 1000).
    #[arg(long, value_name = "N")]
    pub studies: Option<u64>,
    /// Random relabellings per simulated study (default 199).
    #[arg(long, value_name = "N")]
    pub relabellings: Option<u64>,
    /// The largest sample size to try (default 2000).
    #[arg(long = "max-n", value_name = "N")]
    pub max_n: Option<u64>,
    /// Also the smallest detectable effect at N per group.
    #[arg(long = "mde-n", value_name = "N")]
    pub mde_n: Option<u64>,
    /// Seed (default: a fresh one).
    #[arg(long, value_name = "S", value_parser = args::seed)]
    pub seed: Option<u64>,
    /// Whether the first row of the pilot file holds column names.
    #[arg(long, value_enum, default_value = "detect")]
    pub header: HeaderArg,
    /// Where the findings go.
    #[command(flatten)]
    pub outputs: Outputs,
}

impl PlanArgs {
    /// The job this command line describes.
    pub fn job(&self) -> Result<Job, Error> {
        let design = match self.design {
            PlanDesignArg::TwoGroups => PlanDesign::TwoGroups,
            PlanDesignArg::Paired => PlanDesign::Paired,
            PlanDesignArg::KGroups => PlanDesign::KGroups,
            PlanDesignArg::YesNo => PlanDesign::YesNo,
        };
        let model = match (self.sd, self.baseline, &self.value) {
            (Some(sd), None, None) => PlanModel::Normal { sd },
            (None, Some(baseline), None) => PlanModel::Rates { baseline },
            (None, None, Some(value)) => PlanModel::Pilot {
                data: read_data(need(
                    self.file.as_deref(),
                    "A pilot column needs the data file it is in.",
                )?)?,
                header: self.header.into(),
                value: value.clone(),
                multiply: self.multiply,
            },
            _ => {
                return Err(Error::settings(
                    "Give one data model: --sd SD (normal values), FILE --value COL (a pilot \
                     column), or --baseline RATE (yes/no outcomes).",
                ))
            }
        };
        let mut r = PlanRequest::new(
            design,
            model,
            self.effect,
            self.seed.unwrap_or_else(fresh_seed),
        );
        if let Some(m) = &self.means {
            r.means = m.clone();
        }
        r.statistic = self.statistic.clone().unwrap_or_default();
        r.alpha = self.alpha.unwrap_or(r.alpha);
        r.alternative = self.alternative.map_or(Alternative::TwoSided, Into::into);
        r.target_power = self.power.unwrap_or(r.target_power);
        r.studies = self.studies.unwrap_or(r.studies);
        r.relabellings = self.relabellings.unwrap_or(r.relabellings);
        r.max_n = self.max_n.unwrap_or(r.max_n);
        r.mde_n = self.mde_n;
        Ok(Job::Plan(r))
    }
}
