//! The figure keys the rules emit, one constant each: the rules, the
//! drawings and the tests name a figure through these, so that a renamed
//! key fails to compile instead of silently dropping a figure from a
//! drawing. Keys are part of the contract `liftaudit.report/1` (DESIGN
//! "Report v1" names those other tools rely on).

// thrust-margin
pub const WEIGHT: &str = "weight";
pub const AIR_DENSITY: &str = "air_density";
pub const THRUST_PER_ROTOR: &str = "thrust_per_rotor";
pub const THRUST_AVAILABLE: &str = "thrust_available";
pub const HOVER_FRACTION: &str = "hover_fraction";
pub const ROTORS_NEEDED: &str = "rotors_needed";
pub const THRUST_BOUND: &str = "thrust_bound";
pub const FULL_THROTTLE_CURRENT: &str = "full_throttle_current";

// tilt-equilibrium
pub const HOVER_TILT: &str = "hover_tilt";
pub const HORIZONTAL_ACCEL: &str = "horizontal_accel";
pub const HORIZONTAL_FORCE: &str = "horizontal_force";
pub const THRUST_NEEDED: &str = "thrust_needed";
pub const UNCOMPENSATED_TILT: &str = "uncompensated_tilt";
pub const HEADWIND_NEEDED: &str = "headwind_needed";
pub const TILT_NEEDED: &str = "tilt_needed";
pub const STATION_DRAG: &str = "station_drag";
pub const THRUST_IN_WIND: &str = "thrust_in_wind";
pub const POWER_IN_WIND: &str = "power_in_wind";
pub const PITCH_MOMENT: &str = "pitch_moment";
pub const CG_OFFSET_NEEDED: &str = "cg_offset_needed";

// energy-budget
pub const HOVER_POWER: &str = "hover_power";
pub const USABLE_ENERGY: &str = "usable_energy";
pub const ENDURANCE: &str = "endurance";
pub const CLAIMED_FLIGHT_TIME: &str = "claimed_flight_time";
pub const BATTERY_SPECIFIC_ENERGY: &str = "battery_specific_energy";
pub const DISCHARGE_RATE: &str = "discharge_rate";
pub const DISCHARGE_RATING: &str = "discharge_rating";
pub const ENDURANCE_CEILING: &str = "endurance_ceiling";
pub const BEST_BATTERY_MASS: &str = "best_battery_mass";
pub const FLIGHT_SPEED: &str = "flight_speed";
pub const FLIGHT_POWER: &str = "flight_power";

// sensing
pub const MOMENT_OF_INERTIA: &str = "moment_of_inertia";
pub const TIME_TO_TIP: &str = "time_to_tip";
pub const REACTION_TIME: &str = "reaction_time";
pub const ATTITUDE_DRIFT_TIME: &str = "attitude_drift_time";
pub const HEIGHT_DRIFT_TIME: &str = "height_drift_time";
pub const POSITION_DRIFT_TIME: &str = "position_drift_time";
pub const ROTOR_MASS: &str = "rotor_mass";
pub const LOOP_PERIOD: &str = "loop_period";

// control-authority
pub const RANK: &str = "rank";
pub const ACAI: &str = "acai";
pub const MISMATCH_MOMENT: &str = "mismatch_moment";
pub const ACAI_ONE_ROTOR_LOST: &str = "acai_one_rotor_lost";
pub const ACAI_TWO_ROTORS_LOST: &str = "acai_two_rotors_lost";
pub const ACAI_THREE_ROTORS_LOST: &str = "acai_three_rotors_lost";
pub const ACAI_FOUR_ROTORS_LOST: &str = "acai_four_rotors_lost";
/// The worst ACAI with one, two, three and four rotors lost, in that order.
pub const ACAI_ROTORS_LOST: [&str; 4] = [
    ACAI_ONE_ROTOR_LOST,
    ACAI_TWO_ROTORS_LOST,
    ACAI_THREE_ROTORS_LOST,
    ACAI_FOUR_ROTORS_LOST,
];

// sheet-consistency
pub const BATTERY_MASS_SHARE: &str = "battery_mass_share";
pub const MOTORS_AND_PACK_SHARE: &str = "motors_and_pack_share";
pub const PARTS_MASS_SHARE: &str = "parts_mass_share";
pub const PROP_DIAMETER: &str = "prop_diameter";
pub const CLASS_PROP_SMALLEST: &str = "class_prop_smallest";
pub const CLASS_PROP_LARGEST: &str = "class_prop_largest";
pub const ROTOR_SPACING: &str = "rotor_spacing";
pub const ROTOR_OVERLAP: &str = "rotor_overlap";
pub const ROTOR_REACH_LENGTH: &str = "rotor_reach_length";
pub const ROTOR_REACH_WIDTH: &str = "rotor_reach_width";
pub const PRESSURE_ALTITUDE: &str = "pressure_altitude";
