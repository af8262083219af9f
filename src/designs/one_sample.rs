//! One sample against a reference value: the sign-flip test of the values minus the
//! reference (the paired analysis of [`super::paired`] on those differences), a bootstrap
//! interval for their mean or median, and the one-sample t-test and the Wilcoxon
//! signed-rank test as cross-checks.

use serde::{Deserialize, Serialize};

use super::paired::{sign_flip, sign_flip_settings, Differences, FlipStatistic, SignFlipReport};
use super::{Design, DesignKey, TestSettings};
use crate::base::*;
use crate::input::table::{self, HeaderChoice};

/// The one-sample design.
pub struct OneSampleDesign;

/// One column of values and the reference value to compare its centre with.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct OneSampleRequest {
    /// The table as pasted.
    pub data: String,
    /// Whether the first row holds column names.
    #[serde(default)]
    pub header: HeaderChoice,
    /// The column of values.
    pub value: String,
    /// The reference value.
    pub reference: f64,
    /// Mean or median of the differences.
    pub statistic: FlipStatistic,
    /// The test and interval settings.
    pub settings: TestSettings,
}

impl OneSampleRequest {
    /// The defaults the page and the command start from.
    pub fn new(data: String, value: String, reference: f64, seed: u64) -> OneSampleRequest {
        OneSampleRequest {
            data,
            header: HeaderChoice::Detect,
            value,
            reference,
            statistic: FlipStatistic::Mean,
            settings: sign_flip_settings(seed),
        }
    }
}

impl Design for OneSampleDesign {
    const KEY: DesignKey = DesignKey::OneSample;
    type Request = OneSampleRequest;
    type Report = SignFlipReport;

    fn check(req: &OneSampleRequest) -> Result<(), Error> {
        if !req.reference.is_finite() {
            return Err(Error::settings("The reference value must be a number."));
        }
        req.settings.check("sign patterns")
    }

    fn run(req: &OneSampleRequest, progress: ProgressFn) -> Result<SignFlipReport, Error> {
        Self::check(req)?;
        let t = table::parse(&req.data, req.header)?;
        let nums = t.column(&req.value)?.numbers(t.decimal_comma)?;
        let mut notes = t.notes();
        nums.push_notes(&req.value, &mut notes);
        let d: Vec<f64> = nums.values.iter().map(|v| v.1 - req.reference).collect();
        drop((t, nums)); // before the resampling (memory on large tables)
        sign_flip(
            &d,
            Differences::Reference {
                value: req.value.clone(),
                reference: req.reference,
            },
            notes,
            req.statistic,
            &req.settings,
            progress,
        )
    }

    fn data(req: &OneSampleRequest) -> &str {
        &req.data
    }

    fn clear_data(req: &mut OneSampleRequest) {
        req.data.clear();
    }

    fn seed(req: &OneSampleRequest) -> u64 {
        req.settings.seed
    }

    fn test_settings(req: &mut OneSampleRequest) -> Option<&mut TestSettings> {
        Some(&mut req.settings)
    }

    fn test_outcome(report: &SignFlipReport) -> Option<&super::TestOutcome> {
        Some(&report.test)
    }
}

/// Runs a one-sample request.
pub fn run(req: &OneSampleRequest, progress: ProgressFn) -> Result<SignFlipReport, Error> {
    OneSampleDesign::run(req, progress)
}
