//! liftaudit: checks the physical plausibility of claims about small flying
//! machines. See DEVELOPERS.md for the map of the crate.

pub mod catalog;
pub mod claim;
pub mod physics;
pub mod report;
pub mod rules;
pub mod sources;
pub mod tier;
pub mod web;
