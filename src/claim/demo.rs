//! The demo claims, built into the binary so that `liftaudit serve` and
//! `liftaudit check --demo` need no files. All are invented scenarios.

/// One demo claim sheet.
#[derive(Debug, Clone, Copy)]
pub struct Demo {
    /// File stem in `demo-claims/`, used in URLs: `/demo/{name}`.
    pub name: &'static str,
    /// The sheet's TOML text.
    pub text: &'static str,
}

impl Demo {
    /// What the demo shows: its first comment line, without "# Shows: ".
    pub fn shows(&self) -> &'static str {
        self.text
            .lines()
            .next()
            .and_then(|l| l.strip_prefix("# Shows:"))
            .map(str::trim)
            .unwrap_or("")
    }
}

macro_rules! demos {
    ($($name:literal),* $(,)?) => {
        &[$(Demo { name: $name, text: include_str!(concat!("../../demo-claims/", $name, ".toml")) }),*]
    };
}

/// Every demo, in the order the form lists them.
pub const DEMOS: &[Demo] = demos![
    "hover-lamp",
    "classroom-quad",
    "pocket-selfie",
    "ridge-hover",
    "hand-flown-toy",
    "cargo-octo",
    "hallway-hold",
    "super-cell-claim",
    "survivor-hex",
    "tilt-rotor-bicopter",
    "mystery-listing",
];

pub fn find(name: &str) -> Option<&'static Demo> {
    DEMOS.iter().find(|d| d.name == name)
}
