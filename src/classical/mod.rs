//! Classical tests and intervals, reported beside the resampling results as cross-checks.

pub mod anova;
pub mod linear;
pub mod multiple;
pub mod ranks;
pub mod t;
pub mod tables;

pub use anova::{kruskal_wallis, one_way_anova, welch_anova, ChiSquareTest, FTest};
pub use ranks::{rank_sum, RankSum};
pub use t::{t_test, welch, TTest, Welch};
