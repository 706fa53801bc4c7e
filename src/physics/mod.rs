//! Pure formulas on `uom` quantities. Each function's doc line gives its
//! formula and the id of its source in [`crate::sources`]; no function does
//! I/O, keeps state or panics.

pub mod acoustics;
pub mod atmosphere;
pub mod battery;
pub mod body;
pub mod control;
pub mod drag;
pub mod forward;
pub mod propeller;
pub mod rotor;
