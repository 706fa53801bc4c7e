//! The assumption tiers (DESIGN "Assumption tiers and verdicts"): every rule
//! evaluates a claim three times, most generous first, with the laws of
//! physics only, with the best that real hardware of the class achieves, and
//! with what an ordinary build achieves. `catalog` holds the tier table and
//! `report` names the tier of each figure; both use this module.

use std::fmt;
use std::ops::{Index, IndexMut};

use serde::{Serialize, Serializer};
use utoipa::ToSchema;

#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, ToSchema)]
#[serde(rename_all = "kebab-case")]
pub enum Tier {
    PhysicalLimit,
    BestPractice,
    Typical,
}

impl Tier {
    /// Most generous first: the order in which a claim is tried.
    pub const ALL: [Tier; 3] = [Tier::PhysicalLimit, Tier::BestPractice, Tier::Typical];

    pub fn id(self) -> &'static str {
        match self {
            Tier::PhysicalLimit => "physical-limit",
            Tier::BestPractice => "best-practice",
            Tier::Typical => "typical",
        }
    }

    pub fn label(self) -> &'static str {
        match self {
            Tier::PhysicalLimit => "physical limit",
            Tier::BestPractice => "best practice",
            Tier::Typical => "typical build",
        }
    }
}

/// One value per tier, read by the tier (`values[Tier::Typical]`), so that
/// no rule counts positions in an array.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct PerTier<T> {
    pub physical_limit: T,
    pub best_practice: T,
    pub typical: T,
}

impl<T> PerTier<T> {
    pub const fn new(physical_limit: T, best_practice: T, typical: T) -> PerTier<T> {
        PerTier {
            physical_limit,
            best_practice,
            typical,
        }
    }

    /// The value of each tier from `value(tier)`, asked in tier order.
    pub fn from_fn(mut value: impl FnMut(Tier) -> T) -> PerTier<T> {
        let physical_limit = value(Tier::PhysicalLimit);
        let best_practice = value(Tier::BestPractice);
        let typical = value(Tier::Typical);
        PerTier::new(physical_limit, best_practice, typical)
    }

    pub fn map<U>(self, mut f: impl FnMut(T) -> U) -> PerTier<U> {
        let physical_limit = f(self.physical_limit);
        let best_practice = f(self.best_practice);
        let typical = f(self.typical);
        PerTier::new(physical_limit, best_practice, typical)
    }

    /// The values in tier order, most generous first.
    pub fn iter(&self) -> impl Iterator<Item = &T> {
        [&self.physical_limit, &self.best_practice, &self.typical].into_iter()
    }
}

impl<T> Index<Tier> for PerTier<T> {
    type Output = T;

    fn index(&self, tier: Tier) -> &T {
        match tier {
            Tier::PhysicalLimit => &self.physical_limit,
            Tier::BestPractice => &self.best_practice,
            Tier::Typical => &self.typical,
        }
    }
}

impl<T> IndexMut<Tier> for PerTier<T> {
    fn index_mut(&mut self, tier: Tier) -> &mut T {
        match tier {
            Tier::PhysicalLimit => &mut self.physical_limit,
            Tier::BestPractice => &mut self.best_practice,
            Tier::Typical => &mut self.typical,
        }
    }
}

/// As the assumptions list them, most generous first: "1 / 0.75 / 0.45".
impl<T: fmt::Display> fmt::Display for PerTier<T> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "{} / {} / {}",
            self.physical_limit, self.best_practice, self.typical
        )
    }
}

/// A list of three in tier order, as the API's tier table has always given them.
impl<T: Serialize> Serialize for PerTier<T> {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        serializer.collect_seq(self.iter())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn values_are_read_by_tier_and_kept_in_tier_order() {
        let fm = PerTier::new(1.0, 0.75, 0.45);
        assert_eq!(fm[Tier::BestPractice], 0.75);
        assert_eq!(PerTier::from_fn(|t| fm[t]), fm);
        assert_eq!(fm.map(|v| v * 2.0)[Tier::Typical], 0.9);
        assert_eq!(fm.iter().copied().collect::<Vec<_>>(), [1.0, 0.75, 0.45]);
        let asked: Vec<Tier> = {
            let mut asked = Vec::new();
            PerTier::from_fn(|t| asked.push(t));
            asked
        };
        assert_eq!(asked, Tier::ALL);
    }

    #[test]
    fn per_tier_values_read_most_generous_first() {
        assert_eq!(PerTier::new(1.0, 0.75, 0.45).to_string(), "1 / 0.75 / 0.45");
        assert_eq!(
            serde_json::to_string(&PerTier::new(0.0, 0.5, 1.0)).unwrap(),
            "[0.0,0.5,1.0]"
        );
    }
}
