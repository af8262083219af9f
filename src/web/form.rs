//! The page's form as signals, one per field of [`Fields`], so that the views bind to them.
//! Every rule lives in [`crate::page`], in plain Rust tested natively: the job the fields
//! describe, the fields a restored job puts back, what a table read suggests. Here the
//! signals are only read into [`Fields`] and written back.

use leptos::prelude::*;

pub use crate::page::{
    kind_label, parse_count, parse_number, Fields, PlanFields, ADDRESS_DATA_LIMIT, EXAMPLES,
    HUGE_TABLE, HUGE_TABLE_BOOTSTRAP, LARGE_TABLE, RESTORED_SHAPE,
};

use crate::base::{Alternative, Side, TwoSidedRule};
use crate::designs::association::AssocStatistic;
use crate::designs::estimate::Estimate;
use crate::designs::k_groups::KStatistic;
use crate::designs::paired::FlipStatistic;
use crate::designs::stratified::StrataWeights;
use crate::designs::two_groups::Statistic;
use crate::designs::yes_no::YesNoStatistic;
use crate::input::columns::Layout;
use crate::input::suggest::Suggestion;
use crate::input::table::HeaderChoice;
use crate::wire::Job;

/// A struct of one signal per field of a plain struct, with the ways between the two: made
/// from the plain fields, read back into them, written from them (only the fields that
/// differ, so that nothing reruns needlessly) and tracked all at once.
macro_rules! signals {
    ($form:ident, $plain:ident, [$($name:ident: $ty:ty),* $(,)?] $(, nested [$($sub:ident: $subform:ident),*])?) => {
        /// The signals of every field.
        #[derive(Clone, Copy)]
        pub struct $form {
            $(pub $name: RwSignal<$ty>,)*
            $($(pub $sub: $subform,)*)?
        }

        impl $form {
            /// Signals holding these fields.
            pub fn from_fields(f: $plain) -> $form {
                $form {
                    $($name: RwSignal::new(f.$name),)*
                    $($($sub: $subform::from_fields(f.$sub),)*)?
                }
            }

            /// The fields the signals hold now (read untracked).
            pub fn fields(&self) -> $plain {
                $plain {
                    $($name: self.$name.get_untracked(),)*
                    $($($sub: self.$sub.fields(),)*)?
                }
            }

            /// Writes the fields that differ from the signals' values.
            pub fn set_fields(&self, f: $plain) {
                $(
                    if self.$name.with_untracked(|v| *v != f.$name) {
                        self.$name.set(f.$name);
                    }
                )*
                $($(self.$sub.set_fields(f.$sub);)*)?
            }

            /// Reads every field, so that a memo calling this reruns when any changes.
            pub fn track(&self) {
                $(self.$name.track();)*
                $($(self.$sub.track();)*)?
            }
        }
    };
}

signals!(
    PlanForm,
    PlanFields,
    [
        design: String,
        model: String,
        sd: String,
        value: String,
        multiply: bool,
        effect: String,
        means: String,
        baseline: String,
        rate: String,
        stat: String,
        alpha: String,
        power: String,
        alt: Alternative,
        mde_n: String,
        studies: String,
        relabellings: String,
        max_n: String,
    ]
);

signals!(
    Form,
    Fields,
    [
        data: String,
        example: String,
        header: HeaderChoice,
        file_note: String,
        layout_kind: String,
        value_col: String,
        group_col: String,
        col_a: String,
        col_b: String,
        mode: String,
        design: String,
        first: String,
        second: String,
        statistic: Statistic,
        robustness: bool,
        alternative: Alternative,
        two_sided: TwoSidedRule,
        resamples: String,
        exact_limit: String,
        stop_after: String,
        settle_at: String,
        stop_set: bool,
        boot_set: bool,
        bootstrap: String,
        old_kernels: Option<(u32, u64)>,
        confidence: String,
        interval_choice: String,
        seed: String,
        reference: String,
        flip_stat: FlipStatistic,
        assoc_stat: AssocStatistic,
        unit_col: String,
        k_columns: Vec<String>,
        control: String,
        k_stat: KStatistic,
        strata_col: String,
        weights: StrataWeights,
        yn_source: String,
        counts_text: String,
        yn_stat: YesNoStatistic,
        est_kind: Estimate,
        est_q: String,
        est_value: String,
        est_strata: String,
        est_x: String,
        est_y: String,
        paired: bool,
        side: Side,
        est_methods: String,
        shape_seen: String,
        suggestion_note: String,
        suggestion_alternatives: Vec<String>,
    ],
    nested [plan: PlanForm]
);

impl Form {
    /// The form as the page opens.
    pub fn new() -> Form {
        Form::from_fields(Fields::new())
    }

    /// The job the settings on screen describe ([`Fields::job`]).
    pub fn job(&self, seed: u64) -> Result<Job, String> {
        self.fields().job(seed)
    }

    /// Puts a job (from a link or a saved file) on screen ([`Fields::restore`]).
    pub fn restore(&self, job: &Job) {
        let mut f = self.fields();
        f.restore(job);
        self.set_fields(f);
    }

    /// The design the form's question is about ("estimate" and "plan" for those modes),
    /// tracked.
    pub fn wanted(&self) -> String {
        match self.mode.get().as_str() {
            "estimate" => "estimate".into(),
            "plan" => "plan".into(),
            _ => self.design.get(),
        }
    }

    /// Sets the columns from a detected layout ([`Fields::apply_detected`]).
    pub fn apply_detected(&self, detected: &Option<Layout>) -> bool {
        let mut f = self.fields();
        let applied = f.apply_detected(detected);
        self.set_fields(f);
        applied
    }

    /// Applies a design suggestion ([`Fields::apply_suggestion`]).
    pub fn apply_suggestion(&self, sg: &Suggestion, label: &str) {
        let mut f = self.fields();
        f.apply_suggestion(sg, label);
        self.set_fields(f);
    }
}

impl Default for Form {
    fn default() -> Form {
        Form::new()
    }
}
