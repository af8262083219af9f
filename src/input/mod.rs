//! Reading what the user brings: the pasted or dropped table, the columns and groups a design
//! needs, typed counts, and the design a table's shape suggests.

pub mod columns;
pub mod counts;
pub mod outline;
pub mod suggest;
pub mod table;
pub mod text;
