//! Control allocation at hover: where the rotors sit, what each actuator does to
//! thrust, roll, pitch and yaw, which of those axes the actuators can command,
//! and how much margin they leave (the available control authority index,
//! ACAI, source `du-2015`).
//!
//! Body axes follow ROS REP 103 (x forward, y left, z up) with the origin at
//! the centre of mass. Preset rotors are numbered clockwise seen from above,
//! starting at the nose or the first rotor clockwise from it: rotor i sits at
//! azimuth `az` measured clockwise from the nose, x = arm cos(az),
//! y = -arm sin(az), as in `du-2015`.
//!
//! The matrix is plain `f64` in SI: the thrust row in N, moment rows in N m.
//! The ACAI is a distance in that mixed space (N and N m), as in `du-2015`.

use nalgebra::{DVector, Matrix3, Matrix4, Matrix4xX, Vector3, Vector4, SVD};
use serde::Serialize;
use uom::si::f64::{Angle, Force, Length, Torque};
use uom::si::{force::newton, length::meter, torque::newton_meter};

use crate::claim::{Layout, Mount, Rotors, Spin};

/// Relative tolerance below which a singular value, a face normal or an ACAI counts as zero.
const TOL: f64 = 1e-9;

/// One rotor as placed on the airframe.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Placement {
    /// Rotor hub from the centre of mass, body axes.
    pub x: Length,
    pub y: Length,
    pub z: Length,
    pub spin: Spin,
    /// The hinge the rotor tilts about, if it has a tilt actuator.
    pub tilt: Option<Tilt>,
}

/// A tilt actuator: a unit hinge axis in body axes and the tilt either way from hover.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tilt {
    pub hinge: [f64; 3],
    pub range: Angle,
}

/// The four axes a hovering craft must command, in matrix row order.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Axis {
    Thrust,
    Roll,
    Pitch,
    Yaw,
}

impl Axis {
    pub const ALL: [Axis; 4] = [Axis::Thrust, Axis::Roll, Axis::Pitch, Axis::Yaw];

    pub fn id(self) -> &'static str {
        match self {
            Axis::Thrust => "thrust",
            Axis::Roll => "roll",
            Axis::Pitch => "pitch",
            Axis::Yaw => "yaw",
        }
    }
}

/// The tilt either way of a tricopter's yaw servo when the sheet gives no `tilt_range`.
pub fn tri_servo_range() -> Angle {
    use crate::catalog::tiers::{Tier, TRI_SERVO_RANGE};
    Angle::new::<uom::si::angle::degree>(TRI_SERVO_RANGE.at(Tier::Typical))
}

/// Where each rotor sits, how it spins and how it tilts, from the layout preset
/// (with `arm`, `height` and the usual spins or the sheet's `spins`) or from
/// `[[rotors.at]]` for a custom layout (each `z` measured from the rotor plane
/// `height`). A tilting mount hinges each rotor about its arm (about body y for
/// a rotor on the centre, about x for the second of a coaxial pair); a
/// tricopter's tail rotor always has its yaw servo, hinged about its arm.
/// `None` when the layout is unknown or a preset needs the arm and has none.
pub fn placements(rotors: &Rotors) -> Option<Vec<Placement>> {
    use Spin::{Ccw, Cw};
    let layout = rotors.layout?;
    let tilting = rotors.mount == Mount::Tilting;
    let tilt = |hinge, range: Option<Angle>| {
        Some(Tilt {
            hinge,
            range: range?,
        })
    };
    let h = rotors.height;
    if layout == Layout::Custom {
        if rotors.at.is_empty() {
            return None;
        }
        let placed = rotors.at.iter().map(|at| {
            let hinge = at
                .tilt_axis
                .or(tilting.then(|| arm_hinge(at.x, at.y, false)));
            Placement {
                x: at.x,
                y: at.y,
                z: at.z + h,
                spin: at.spin,
                tilt: hinge.and_then(|g| tilt(g, at.tilt_range.or(rotors.tilt_range))),
            }
        });
        return Some(placed.collect());
    }
    // Azimuths in degrees, clockwise from the nose seen from above.
    let ring = |n: usize, first: f64| -> Vec<f64> {
        (0..n)
            .map(|i| first + i as f64 * 360.0 / n as f64)
            .collect()
    };
    let (azimuths, arm) = match layout {
        Layout::Single => (vec![0.0], mm0()),
        Layout::Coaxial => (vec![0.0; 2], mm0()),
        Layout::SideBySide => (vec![90.0, 270.0], rotors.arm?),
        Layout::Tri => (ring(3, 60.0), rotors.arm?),
        Layout::QuadX => (ring(4, 45.0), rotors.arm?),
        Layout::QuadPlus => (ring(4, 0.0), rotors.arm?),
        Layout::Hex => (ring(6, 0.0), rotors.arm?),
        Layout::Octo => (ring(8, 0.0), rotors.arm?),
        Layout::Custom => return None,
    };
    let spins = match (&rotors.spins, layout) {
        (Some(s), _) => s.clone(),
        (None, Layout::Tri) => vec![Cw, Cw, Ccw],
        (None, _) => (0..azimuths.len()).map(|i| [Cw, Ccw][i % 2]).collect(),
    };
    if spins.len() != azimuths.len() {
        return None;
    }
    let placed = azimuths
        .iter()
        .zip(spins)
        .enumerate()
        .map(|(i, (az, spin))| {
            let (x, y) = (arm * az.to_radians().cos(), -arm * az.to_radians().sin());
            let hinge = arm_hinge(x, y, i == 1);
            let tri_tail = layout == Layout::Tri && i == 1;
            Placement {
                x,
                y,
                z: h,
                spin,
                tilt: match (tilting, tri_tail) {
                    (true, _) => tilt(hinge, rotors.tilt_range),
                    (false, true) => tilt(hinge, rotors.tilt_range.or(Some(tri_servo_range()))),
                    (false, false) => None,
                },
            }
        });
    Some(placed.collect())
}

fn mm0() -> Length {
    Length::new::<meter>(0.0)
}

/// The unit hinge along the arm from the centre to (x, y); on the centre, body y
/// (or x for the `second` rotor of a coaxial pair, making a two-axis gimbal).
fn arm_hinge(x: Length, y: Length, second: bool) -> [f64; 3] {
    let (x, y) = (x.get::<meter>(), y.get::<meter>());
    let r = x.hypot(y);
    match (r > 0.0, second) {
        (true, _) => [x / r, y / r, 0.0],
        (false, false) => [0.0, 1.0, 0.0],
        (false, true) => [1.0, 0.0, 0.0],
    }
}

/// What one column of the effectiveness matrix is: a rotor's thrust or its tilt.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct Actuator {
    /// Index of the rotor in [`placements`] order, from 0.
    pub rotor: usize,
    pub tilt: bool,
}

/// The control-effectiveness matrix at hover, one column per actuator.
#[derive(Debug, Clone, PartialEq)]
pub struct Effectiveness {
    /// Rows thrust (N), roll, pitch, yaw (N m); per newton of rotor thrust, or
    /// per unit sine of tilt.
    pub matrix: Matrix4xX<f64>,
    pub actuators: Vec<Actuator>,
}

impl Effectiveness {
    /// The columns of the actuators of rotors not in `lost`.
    pub fn without(&self, lost: &[usize]) -> Matrix4xX<f64> {
        let keep: Vec<_> = (0..self.actuators.len())
            .filter(|&j| !lost.contains(&self.actuators[j].rotor))
            .map(|j| self.matrix.column(j).into_owned())
            .collect();
        Matrix4xX::from_columns(&keep)
    }
}

fn sign(spin: Spin) -> f64 {
    match spin {
        Spin::Cw => 1.0,
        Spin::Ccw => -1.0,
    }
}

/// Force and moment per unit thrust along `dir` at `r`: [dir_z, r x dir + s k dir], with
/// s = +1 for a clockwise rotor, whose drag torque turns the body anticlockwise (`du-2015`).
fn wrench(r: Vector3<f64>, dir: Vector3<f64>, spin: Spin, k: f64) -> Vector4<f64> {
    let m = r.cross(&dir) + dir * (sign(spin) * k);
    Vector4::new(dir.z, m.x, m.y, m.z)
}

/// The matrix B with columns [1, y, -x, s k] per rotor thrust and T_h [0, r x d + s k d],
/// d = hinge x z, per tilt actuator, linearised at hover thrust T_h (`du-2015`, `statics`).
pub fn effectiveness(
    placements: &[Placement],
    hover_thrust: Force,
    torque_ratio: Length,
) -> Effectiveness {
    let (th, k) = (hover_thrust.get::<newton>(), torque_ratio.get::<meter>());
    let up = Vector3::z();
    let mut columns = Vec::new();
    let mut actuators = Vec::new();
    for (i, p) in placements.iter().enumerate() {
        let r = Vector3::new(p.x.get::<meter>(), p.y.get::<meter>(), p.z.get::<meter>());
        columns.push(wrench(r, up, p.spin, k));
        actuators.push(Actuator {
            rotor: i,
            tilt: false,
        });
        if let Some(t) = p.tilt {
            let d = Vector3::from(t.hinge).cross(&up);
            columns.push(wrench(r, d, p.spin, k) * th);
            actuators.push(Actuator {
                rotor: i,
                tilt: true,
            });
        }
    }
    Effectiveness {
        matrix: Matrix4xX::from_columns(&columns),
        actuators,
    }
}

/// Which axes the actuators can command.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Authority {
    /// Rank of the effectiveness matrix: 4 when every axis can be set on its own.
    pub rank: usize,
    /// Axes that cannot be set once the ones before them (thrust, roll, pitch, yaw) are.
    pub lacking: Vec<Axis>,
    /// Axes no actuator moves at all.
    pub unmoved: Vec<Axis>,
    /// Axes that actuators move but only together with others (one input, several axes).
    pub tied: Vec<Axis>,
}

/// Singular values of `m` (padded to four columns, so there are always
/// four) and its left singular vectors. Up to four columns the matrix is
/// square and fixed in size, so the decomposition runs without the heap.
fn svd(m: &Matrix4xX<f64>) -> Option<([f64; 4], [Vector4<f64>; 4])> {
    if m.iter().any(|v| !v.is_finite()) {
        return None;
    }
    if m.ncols() <= 4 {
        let mut square = Matrix4::zeros();
        square.columns_mut(0, m.ncols()).copy_from(m);
        let svd = SVD::try_new(square, true, false, f64::EPSILON, 10_000)?;
        let u = svd.u?;
        return Some((
            std::array::from_fn(|j| svd.singular_values[j]),
            std::array::from_fn(|j| u.column(j).into_owned()),
        ));
    }
    let svd = SVD::try_new(m.clone(), true, false, f64::EPSILON, 10_000)?;
    let u = svd.u?;
    Some((
        std::array::from_fn(|j| svd.singular_values[j]),
        std::array::from_fn(|j| u.column(j).into_owned()),
    ))
}

/// For each row of `m` in order, whether it adds a direction to the rows
/// before it: its part orthogonal to them (modified Gram-Schmidt, applied
/// twice for round-off) is longer than `TOL` times `scale`. The axes are
/// taken in the order thrust, roll, pitch, yaw, so a lacking axis is one
/// whose row the earlier axes already span.
fn independent_rows(m: &Matrix4xX<f64>, scale: f64) -> [bool; 4] {
    let mut basis: Vec<DVector<f64>> = Vec::with_capacity(4);
    let mut independent = [false; 4];
    for (i, flag) in independent.iter_mut().enumerate() {
        let mut r: DVector<f64> = m.row(i).transpose();
        for _ in 0..2 {
            for q in &basis {
                let along = q.dot(&r);
                r.axpy(-along, q, 1.0);
            }
        }
        let length = r.norm();
        if length > TOL * scale {
            r.unscale_mut(length);
            basis.push(r);
            *flag = true;
        }
    }
    independent
}

/// Rank of B (SVD, relative tolerance), the axes it cannot command, and why.
pub fn authority(b: &Matrix4xX<f64>) -> Authority {
    let Some((sigma, u)) = svd(b) else {
        return Authority {
            rank: 0,
            lacking: Axis::ALL.to_vec(),
            unmoved: Axis::ALL.to_vec(),
            tied: Vec::new(),
        };
    };
    let scale = sigma.first().copied().unwrap_or(0.0);
    let rank = sigma.iter().filter(|&&v| v > TOL * scale).count();
    // Left null space: directions of force and moment that no actuator produces.
    let null = &u[rank..];
    let unmoved: Vec<Axis> = Axis::ALL
        .into_iter()
        .enumerate()
        .filter(|&(i, _)| b.row(i).iter().all(|v| v.abs() <= TOL * scale))
        .map(|(_, a)| a)
        .collect();
    let tied = Axis::ALL
        .into_iter()
        .enumerate()
        .filter(|&(i, a)| !unmoved.contains(&a) && null.iter().any(|n| n[i].abs() > 1e-6))
        .map(|(_, a)| a)
        .collect();
    let lacking = Axis::ALL
        .into_iter()
        .zip(independent_rows(b, scale))
        .filter(|&(_, independent)| !independent)
        .map(|(a, _)| a)
        .collect();
    Authority {
        rank,
        lacking,
        unmoved,
        tied,
    }
}

/// Every k-element subset of 0..n, in lexicographic order.
pub fn combinations(n: usize, k: usize) -> Vec<Vec<usize>> {
    let mut out = Vec::new();
    let mut pick: Vec<usize> = (0..k).collect();
    if k > n {
        return out;
    }
    loop {
        out.push(pick.clone());
        // The rightmost index that can still move right, then reset those after it.
        let Some(i) = (0..k).rev().find(|&i| pick[i] < n - k + i) else {
            return out;
        };
        pick[i] += 1;
        for j in i + 1..k {
            pick[j] = pick[j - 1] + 1;
        }
    }
}

/// Unit normal of the span of three columns in R^4 (signed 3x3 minors), if they are independent.
fn normal(a: Vector4<f64>, b: Vector4<f64>, c: Vector4<f64>) -> Option<Vector4<f64>> {
    // The rows left when row `skip` is struck out.
    const ROWS: [[usize; 3]; 4] = [[1, 2, 3], [0, 2, 3], [0, 1, 3], [0, 1, 2]];
    let minor = |skip: usize| {
        let rows = ROWS[skip];
        Matrix3::from_fn(|i, j| [a, b, c][j][rows[i]]).determinant()
    };
    let n = Vector4::new(minor(0), -minor(1), minor(2), -minor(3));
    (n.norm() > TOL * a.norm() * b.norm() * c.norm()).then(|| n.normalize())
}

/// ACAI: the signed distance from the hover point `g` to the boundary of the attainable
/// set {B u : lo <= u <= hi}, min over face normals xi of
/// sum_j |xi . b_j| (hi_j - lo_j) / 2 - |xi . (g - B (lo + hi) / 2)| (`du-2015`).
/// Faces are spanned by three independent generators (columns with hi > lo), or,
/// when the generators span less than R^4, lie across their left null space.
pub fn acai(b: &Matrix4xX<f64>, lo: &[f64], hi: &[f64], g: Vector4<f64>) -> f64 {
    let centre: Vector4<f64> = (0..b.ncols())
        .map(|j| b.column(j) * ((lo[j] + hi[j]) / 2.0))
        .sum();
    let gens: Vec<(Vector4<f64>, f64)> = (0..b.ncols())
        .filter(|&j| hi[j] > lo[j])
        .map(|j| (b.column(j).into_owned(), (hi[j] - lo[j]) / 2.0))
        .collect();
    let offset = g - centre;
    let value = |xi: &Vector4<f64>| {
        gens.iter().map(|(c, r)| xi.dot(c).abs() * r).sum::<f64>() - xi.dot(&offset).abs()
    };
    // Every face normal from three independent generators, walked without collecting.
    let m = gens.len();
    let mut min = f64::INFINITY;
    let mut faces = 0usize;
    for i in 0..m {
        for j in i + 1..m {
            for k in j + 1..m {
                if let Some(xi) = normal(gens[i].0, gens[j].0, gens[k].0) {
                    min = min.min(value(&xi));
                    faces += 1;
                }
            }
        }
    }
    // With three independent generators their normals already hold the left null
    // space (rank 3: the one normal; rank 4: none). Only below rank 3 does it take an
    // SVD to find the directions across which the set is flat.
    if faces == 0 {
        let gen_matrix =
            Matrix4xX::from_columns(&gens.iter().map(|(c, r)| c * *r).collect::<Vec<_>>());
        if let Some((sigma, u)) = svd(&gen_matrix) {
            let scale = sigma.first().copied().unwrap_or(0.0);
            let rank = sigma.iter().filter(|&&v| v > TOL * scale).count();
            min = u[rank..].iter().map(value).fold(min, f64::min);
        }
    }
    // Snap round-off to the exact zero of a hover point on a face (e.g. a lost rotor, `du-2015`).
    let scale: f64 = gens.iter().map(|(c, r)| c.norm() * r).sum::<f64>() + offset.norm();
    if min.abs() <= TOL * scale {
        0.0
    } else {
        min
    }
}

/// What the ACAI of one hover case needs: the weight to hold, each rotor's maximum
/// thrust, and the propeller's drag-torque to thrust ratio.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Hover {
    pub weight: Force,
    pub rotor_thrust: Force,
    pub torque_ratio: Length,
}

/// The face normals of one airframe's attainable set, worked out once and reused for
/// every set of lost rotors and every thrust bound: a lost rotor only removes its
/// generators, and the hover thrust only scales the tilt columns, so the normal of
/// each remaining triple of generators stays the same (`du-2015`).
pub struct Faces {
    /// B at a hover thrust of 1 N: tilt columns per newton of hover thrust.
    unit: Effectiveness,
    faces: Vec<Face>,
}

/// One face normal, the three actuators spanning it, and |xi . b_j| for every unit column.
struct Face {
    xi: Vector4<f64>,
    spanned: [usize; 3],
    dots: Vec<f64>,
}

impl Faces {
    /// Every normal of three independent columns of the airframe's matrix.
    pub fn new(placements: &[Placement], torque_ratio: Length) -> Faces {
        let unit = effectiveness(placements, Force::new::<newton>(1.0), torque_ratio);
        let b = &unit.matrix;
        let m = b.ncols();
        let col = |j: usize| b.column(j).into_owned();
        let mut faces = Vec::new();
        for i in 0..m {
            for j in i + 1..m {
                for k in j + 1..m {
                    if let Some(xi) = normal(col(i), col(j), col(k)) {
                        let dots = (0..m).map(|c| xi.dot(&b.column(c)).abs()).collect();
                        faces.push(Face {
                            xi,
                            spanned: [i, j, k],
                            dots,
                        });
                    }
                }
            }
        }
        Faces { unit, faces }
    }

    /// ACAI of hovering at weight W with the rotors in `lost` stopped (thrust 0..0, tilt
    /// fixed), the others 0..T_max and tilting +-sin(range), linearised at W / n_alive
    /// (`du-2015`): the same value as [`acai`] on that matrix and those bounds.
    pub fn hover_acai(&self, placements: &[Placement], hover: &Hover, lost: &[usize]) -> f64 {
        let alive = placements.len() - lost.len().min(placements.len());
        let share = hover.weight.get::<newton>() / (alive.max(1) as f64);
        let tmax = hover.rotor_thrust.get::<newton>();
        let actuators = &self.unit.actuators;
        // Each column's scale (1 for thrust, the hover share for tilt) and bounds.
        let bounds = |a: &Actuator| {
            let scale = if a.tilt { share } else { 1.0 };
            let hi = match (lost.contains(&a.rotor), a.tilt) {
                (true, _) => 0.0,
                (false, false) => tmax,
                (false, true) => placements[a.rotor]
                    .tilt
                    .map_or(0.0, |t| t.range.sin().value),
            };
            let lo = if a.tilt { -hi } else { 0.0 };
            (scale, lo, hi)
        };
        let g = Vector4::new(hover.weight.get::<newton>(), 0.0, 0.0, 0.0);
        let b = &self.unit.matrix;
        // The centre of the attainable set, and each column's half range and
        // whether it can move at all: one pass, one buffer.
        let mut centre = Vector4::zeros();
        let mut half = Vec::with_capacity(actuators.len());
        for (j, a) in actuators.iter().enumerate() {
            let (scale, lo, hi) = bounds(a);
            centre += b.column(j) * (scale * (lo + hi) / 2.0);
            half.push((scale * (hi - lo) / 2.0, hi > lo));
        }
        let offset = g - centre;
        let mut min = f64::INFINITY;
        let mut faces = 0usize;
        for f in self
            .faces
            .iter()
            .filter(|f| f.spanned.iter().all(|&j| half[j].1))
        {
            let support: f64 = f.dots.iter().zip(&half).map(|(d, r)| d * r.0).sum();
            min = min.min(support - f.xi.dot(&offset).abs());
            faces += 1;
        }
        if faces == 0 {
            // Below rank 3 the flat directions need an SVD: the general routine does it.
            let (scale, (lo, hi)): (Vec<f64>, (Vec<f64>, Vec<f64>)) = actuators
                .iter()
                .map(|a| {
                    let (scale, lo, hi) = bounds(a);
                    (scale, (lo, hi))
                })
                .unzip();
            let scaled = Matrix4xX::from_fn(b.ncols(), |r, c| b[(r, c)] * scale[c]);
            return acai(&scaled, &lo, &hi, g);
        }
        // Snap round-off to the exact zero of a hover point on a face (e.g. a lost rotor).
        let size: f64 = (0..b.ncols())
            .map(|j| b.column(j).norm() * half[j].0)
            .sum::<f64>()
            + offset.norm();
        if min.abs() <= TOL * size {
            0.0
        } else {
            min
        }
    }
}

/// ACAI of hovering at weight W with the rotors in `lost` stopped; see [`Faces::hover_acai`].
pub fn hover_acai(placements: &[Placement], hover: &Hover, lost: &[usize]) -> f64 {
    Faces::new(placements, hover.torque_ratio).hover_acai(placements, hover, lost)
}

/// Moment of a thrust error dT on one rotor, |dT| sqrt(x^2 + y^2 + k^2) (roll, pitch
/// and yaw together, the moment rows of its column times dT, `du-2015`).
pub fn mismatch_moment(p: &Placement, error: Force, torque_ratio: Length) -> Torque {
    let (x, y) = (p.x.get::<meter>(), p.y.get::<meter>());
    let lever = (x * x + y * y + torque_ratio.get::<meter>().powi(2)).sqrt();
    Torque::new::<newton_meter>(error.get::<newton>().abs() * lever)
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::angle::degree;

    use crate::claim::RotorAt;

    fn mm(v: f64) -> Length {
        Length::new::<uom::si::length::millimeter>(v)
    }

    fn rotors(layout: Layout, count: u32, arm: f64) -> Rotors {
        Rotors {
            count,
            layout: Some(layout),
            arm: Some(mm(arm)),
            diameter: Some(mm(127.0)),
            mount: Mount::Fixed,
            tilt_range: None,
            height: mm(0.0),
            motor: None,
            drive: None,
            max_thrust: None,
            max_thrust_from_mass: false,
            max_power: None,
            spins: None,
            at: Vec::new(),
        }
    }

    fn n(v: f64) -> Force {
        Force::new::<newton>(v)
    }

    /// Du et al. 2015 example hexacopter: m = 1.535 kg, g = 9.80, arm 0.275 m, 0..6.125 N, k = 0.1 m.
    fn du_hover() -> Hover {
        Hover {
            weight: n(1.535 * 9.80),
            rotor_thrust: n(6.125),
            torque_ratio: Length::new::<meter>(0.1),
        }
    }

    fn hexacopter(spins: [Spin; 6]) -> Vec<Placement> {
        let mut r = rotors(Layout::Hex, 6, 275.0);
        r.spins = Some(spins.to_vec());
        placements(&r).unwrap()
    }

    use Spin::{Ccw as N, Cw as P};

    /// Du's matrix written out as the paper gives it: columns [1, -d sin az, d cos az, 0.1 spin].
    fn du_matrix(spins: [f64; 6]) -> Matrix4xX<f64> {
        let cols: Vec<Vector4<f64>> = (0..6)
            .map(|i| {
                let az = (i as f64 * 60.0).to_radians();
                Vector4::new(1.0, -0.275 * az.sin(), 0.275 * az.cos(), 0.1 * spins[i])
            })
            .collect();
        Matrix4xX::from_columns(&cols)
    }

    #[test]
    fn du_2015_alternating_hexacopter_has_acai_1_4861_written_as_the_paper_gives_it() {
        // du-2015, example hexacopter: ACAI = 1.4861 intact, 0 with any one rotor lost.
        let b = du_matrix([1.0, -1.0, 1.0, -1.0, 1.0, -1.0]);
        let g = Vector4::new(1.535 * 9.80, 0.0, 0.0, 0.0);
        let v = acai(&b, &[0.0; 6], &[6.125; 6], g);
        assert!((v - 1.4861).abs() < 1e-3, "{v}");
        for lost in 0..6 {
            let mut hi = [6.125; 6];
            hi[lost] = 0.0;
            assert!(acai(&b, &[0.0; 6], &hi, g).abs() < 1e-3);
        }
    }

    #[test]
    fn du_2015_alternating_hexacopter_from_the_hex_preset_matches() {
        // du-2015: ACAI = 1.4861 intact, 0 with any one rotor lost (within 1e-3).
        let hex = hexacopter([P, N, P, N, P, N]);
        let intact = hover_acai(&hex, &du_hover(), &[]);
        assert!((intact - 1.4861).abs() < 1e-3, "{intact}");
        for lost in 0..6 {
            let v = hover_acai(&hex, &du_hover(), &[lost]);
            assert!(v.abs() < 1e-3, "rotor {} lost: {v}", lost + 1);
        }
    }

    #[test]
    fn du_2015_ppnnpn_hexacopter_survives_losing_rotors_1_to_4_but_not_5_or_6() {
        // du-2015: spins P P N N P N, ACAI > 0 with rotor 1, 2, 3 or 4 lost, < 0 with 5 or 6.
        let hex = hexacopter([P, P, N, N, P, N]);
        for lost in 0..6 {
            let v = hover_acai(&hex, &du_hover(), &[lost]);
            assert_eq!(v > 0.0, lost < 4, "rotor {} lost: {v}", lost + 1);
            assert!(v != 0.0);
        }
    }

    #[test]
    fn a_quadrotor_that_loses_any_rotor_has_negative_acai() {
        // du-2015: a quadrotor that loses any rotor has ACAI < 0.
        for layout in [Layout::QuadX, Layout::QuadPlus] {
            let quad = placements(&rotors(layout, 4, 275.0)).unwrap();
            let hover = Hover {
                weight: n(1.535 * 9.80),
                rotor_thrust: n(6.125),
                torque_ratio: Length::new::<meter>(0.1),
            };
            assert!(hover_acai(&quad, &hover, &[]) > 0.0);
            for lost in 0..4 {
                assert!(hover_acai(&quad, &hover, &[lost]) < 0.0);
            }
        }
    }

    #[test]
    fn the_lacking_axes_are_as_many_as_the_rank_falls_short_of_four() {
        // Linear algebra: the greedy row test keeps a basis of the row space,
        // so it keeps exactly rank-many rows (the rank from the SVD).
        let mut x: u64 = 0x2545_F491_4F6C_DD1D;
        let mut next = || {
            x ^= x << 13;
            x ^= x >> 7;
            x ^= x << 17;
            (x >> 11) as f64 / (1u64 << 53) as f64 - 0.5
        };
        for cols in [2, 4, 6, 8] {
            for dependent in 0..4 {
                let mut m = Matrix4xX::from_fn(cols, |_, _| next());
                // Make the last `dependent` rows combinations of the first ones.
                for row in 4 - dependent..4 {
                    let (a, b) = (next(), next());
                    let mix = m.row(0) * a + m.row(1 % (4 - dependent)) * b;
                    m.set_row(row, &mix);
                }
                let a = authority(&m);
                assert_eq!(
                    a.lacking.len(),
                    4 - a.rank,
                    "{cols} columns, {dependent} dependent"
                );
                assert_eq!(a.rank, (4 - dependent).min(cols));
            }
        }
    }

    #[test]
    fn two_fixed_side_by_side_rotors_have_rank_2_with_roll_and_yaw_on_one_input() {
        // DESIGN rule 5: two fixed rotors give rank 2: roll and yaw share one input.
        let pair = placements(&rotors(Layout::SideBySide, 2, 70.0)).unwrap();
        let a = authority(&effectiveness(&pair, n(1.5), mm(3.0)).matrix);
        assert_eq!(a.rank, 2);
        assert_eq!(a.lacking, [Axis::Pitch, Axis::Yaw]);
        assert_eq!(a.unmoved, [Axis::Pitch]);
        assert_eq!(a.tied, [Axis::Roll, Axis::Yaw]);
    }

    #[test]
    fn two_tilting_rotors_command_pitch_only_through_their_height() {
        // DESIGN rule 5: a tilting rotor makes a pitch moment only through its height.
        let mut r = rotors(Layout::SideBySide, 2, 70.0);
        r.mount = Mount::Tilting;
        r.tilt_range = Some(Angle::new::<degree>(30.0));
        let flat = placements(&r).unwrap();
        let hinge = flat[0].tilt.unwrap().hinge;
        assert!(
            hinge[1].abs() > 1.0 - 1e-12,
            "hinge about body y: {hinge:?}"
        );
        let a = authority(&effectiveness(&flat, n(1.5), mm(3.0)).matrix);
        assert_eq!(
            (a.rank, a.lacking.as_slice()),
            (3, [Axis::Pitch].as_slice())
        );

        r.height = mm(40.0);
        let raised = placements(&r).unwrap();
        assert_eq!(
            authority(&effectiveness(&raised, n(1.5), mm(3.0)).matrix).rank,
            4
        );
        let hover = Hover {
            weight: n(3.0),
            rotor_thrust: n(2.5),
            torque_ratio: mm(3.0),
        };
        assert!(hover_acai(&raised, &hover, &[]) > 0.0);
    }

    /// The ACAI straight from the definition: the matrix at the hover share, the bounds
    /// of each actuator, and the general routine, with no faces reused.
    fn direct_acai(p: &[Placement], hover: &Hover, lost: &[usize]) -> f64 {
        let alive = (p.len() - lost.len()) as f64;
        let e = effectiveness(p, hover.weight / alive, hover.torque_ratio);
        let hi: Vec<f64> = e
            .actuators
            .iter()
            .map(|a| match (lost.contains(&a.rotor), a.tilt) {
                (true, _) => 0.0,
                (false, false) => hover.rotor_thrust.get::<newton>(),
                (false, true) => p[a.rotor].tilt.map_or(0.0, |t| t.range.sin().value),
            })
            .collect();
        let lo: Vec<f64> = e
            .actuators
            .iter()
            .zip(&hi)
            .map(|(a, h)| if a.tilt { -h } else { 0.0 })
            .collect();
        acai(
            &e.matrix,
            &lo,
            &hi,
            Vector4::new(hover.weight.get::<newton>(), 0.0, 0.0, 0.0),
        )
    }

    #[test]
    fn reused_faces_give_the_acai_of_the_definition_for_every_lost_set() {
        // The faces of the intact set serve every lost set: a tilting octocopter with a
        // height, and the Du et al. 2015 hexacopter, each single and pair lost.
        let mut octo = rotors(Layout::Octo, 8, 300.0);
        octo.mount = Mount::Tilting;
        octo.tilt_range = Some(Angle::new::<degree>(20.0));
        octo.height = mm(50.0);
        let cases = [
            (
                placements(&octo).unwrap(),
                Hover {
                    weight: n(60.0),
                    rotor_thrust: n(15.0),
                    torque_ratio: mm(20.0),
                },
            ),
            (
                hexacopter([
                    Spin::Cw,
                    Spin::Cw,
                    Spin::Ccw,
                    Spin::Ccw,
                    Spin::Cw,
                    Spin::Ccw,
                ]),
                du_hover(),
            ),
        ];
        for (p, hover) in cases {
            let faces = Faces::new(&p, hover.torque_ratio);
            let mut sets = vec![vec![]];
            sets.extend(combinations(p.len(), 1));
            sets.extend(combinations(p.len(), 2));
            for lost in sets {
                let (a, b) = (
                    faces.hover_acai(&p, &hover, &lost),
                    direct_acai(&p, &hover, &lost),
                );
                assert!(
                    (a - b).abs() <= 1e-9 * (1.0 + b.abs()),
                    "{lost:?}: {a} vs {b}"
                );
            }
        }
    }

    #[test]
    fn a_tricopter_needs_its_yaw_servo() {
        // A tricopter's three thrusts set thrust, roll and pitch; the tail servo sets yaw.
        let tri = placements(&rotors(Layout::Tri, 3, 250.0)).unwrap();
        assert!(tri[1].tilt.is_some() && tri[0].tilt.is_none());
        let hover = Hover {
            weight: n(10.0),
            rotor_thrust: n(7.0),
            torque_ratio: mm(15.0),
        };
        assert_eq!(
            authority(&effectiveness(&tri, n(3.3), mm(15.0)).matrix).rank,
            4
        );
        assert!(hover_acai(&tri, &hover, &[]) > 0.0);

        let no_servo: Vec<Placement> = tri.iter().map(|p| Placement { tilt: None, ..*p }).collect();
        let a = authority(&effectiveness(&no_servo, n(3.3), mm(15.0)).matrix);
        assert_eq!((a.rank, a.lacking.as_slice()), (3, [Axis::Yaw].as_slice()));
        assert!(hover_acai(&no_servo, &hover, &[]) <= 0.0);
    }

    #[test]
    fn a_custom_layout_places_rotors_from_the_sheet_above_the_rotor_plane() {
        let mut r = rotors(Layout::Custom, 2, 0.0);
        r.arm = None;
        r.height = mm(20.0);
        r.at = vec![
            RotorAt {
                x: mm(0.0),
                y: mm(80.0),
                z: mm(5.0),
                spin: Spin::Ccw,
                tilt_axis: Some([0.0, 1.0, 0.0]),
                tilt_range: Some(Angle::new::<degree>(20.0)),
            },
            RotorAt {
                x: mm(0.0),
                y: mm(-80.0),
                z: mm(5.0),
                spin: Spin::Cw,
                tilt_axis: None,
                tilt_range: None,
            },
        ];
        let p = placements(&r).unwrap();
        assert!((p[0].z - mm(25.0)).abs() < mm(1e-9));
        assert!(p[0].tilt.is_some() && p[1].tilt.is_none());
        // One tilting rotor of two: thrust, roll, pitch (through the height), yaw (tied): rank 3.
        assert_eq!(
            authority(&effectiveness(&p, n(1.0), mm(2.0)).matrix).rank,
            3
        );
    }

    #[test]
    fn a_preset_without_its_arm_or_an_unknown_layout_has_no_placements() {
        let mut r = rotors(Layout::QuadX, 4, 100.0);
        r.arm = None;
        assert!(placements(&r).is_none());
        r.layout = None;
        assert!(placements(&r).is_none());
        let mut single = rotors(Layout::Single, 1, 0.0);
        single.arm = None;
        assert_eq!(placements(&single).unwrap().len(), 1);
    }

    #[test]
    fn combinations_are_listed_once_each() {
        assert_eq!(combinations(4, 2).len(), 6);
        assert_eq!(combinations(6, 3).len(), 20);
        assert_eq!(combinations(3, 0), vec![Vec::<usize>::new()]);
        assert!(combinations(2, 3).is_empty());
    }

    /// Independent check of the ACAI: the least over unit directions xi of the support
    /// function h(xi) = xi . c + sum_j |xi . b_j| r_j less xi . g, searched by sampling
    /// (a linear congruential generator) and then by shrinking random steps from the best.
    /// For a hover point inside the set the true least value is the ACAI, so this lies above it.
    fn sampled_acai(b: &Matrix4xX<f64>, lo: &[f64], hi: &[f64], g: Vector4<f64>) -> f64 {
        let mut state: u64 = 0x2545_f491_4f6c_dd1d;
        let mut uniform = || {
            // Knuth's MMIX linear congruential generator.
            state = state
                .wrapping_mul(6_364_136_223_846_793_005)
                .wrapping_add(1_442_695_040_888_963_407);
            (state >> 11) as f64 / (1u64 << 53) as f64 * 2.0 - 1.0
        };
        let margin = |xi: Vector4<f64>| {
            let xi = xi.normalize();
            let h: f64 = (0..b.ncols())
                .map(|j| {
                    let p = xi.dot(&b.column(j));
                    p * (lo[j] + hi[j]) / 2.0 + p.abs() * (hi[j] - lo[j]) / 2.0
                })
                .sum();
            h - xi.dot(&g)
        };
        let mut best = (f64::INFINITY, Vector4::x());
        for _ in 0..20_000 {
            let xi = Vector4::new(uniform(), uniform(), uniform(), uniform());
            if xi.norm() > 1e-3 && margin(xi) < best.0 {
                best = (margin(xi), xi.normalize());
            }
        }
        let mut step = 0.1;
        while step > 1e-7 {
            for _ in 0..200 {
                let xi = best.1 + Vector4::new(uniform(), uniform(), uniform(), uniform()) * step;
                if margin(xi) < best.0 {
                    best = (margin(xi), xi.normalize());
                }
            }
            step /= 2.0;
        }
        best.0
    }

    #[test]
    fn sampled_support_directions_approach_the_acai_from_above() {
        // du-2015 hexacopter (alternating and P P N N P N with rotor 1 lost), and a tilting bicopter.
        let g = Vector4::new(1.535 * 9.80, 0.0, 0.0, 0.0);
        let alternating = du_matrix([1.0, -1.0, 1.0, -1.0, 1.0, -1.0]);
        let ppnnpn = du_matrix([1.0, 1.0, -1.0, -1.0, 1.0, -1.0]);
        let mut one_lost = [6.125; 6];
        one_lost[0] = 0.0;
        // Tilting bicopter, rotors 40 mm above the centre of mass, tilting +-30 deg.
        let mut r = rotors(Layout::SideBySide, 2, 70.0);
        (r.mount, r.height) = (Mount::Tilting, mm(40.0));
        r.tilt_range = Some(Angle::new::<degree>(30.0));
        let bicopter = effectiveness(&placements(&r).unwrap(), n(1.5), mm(3.0)).matrix;
        let s = 30f64.to_radians().sin();
        let cases = [
            (alternating, vec![0.0; 6], vec![6.125; 6], g),
            (ppnnpn, vec![0.0; 6], one_lost.to_vec(), g),
            (
                bicopter,
                vec![0.0, -s, 0.0, -s],
                vec![2.5, s, 2.5, s],
                g / 5.0,
            ),
        ];
        for (b, lo, hi, g) in &cases {
            let g = *g;
            let exact = acai(b, lo, hi, g);
            let sampled = sampled_acai(b, lo, hi, g);
            assert!(
                exact > 0.0 && sampled >= exact - 1e-9,
                "{sampled} < {exact}"
            );
            assert!(
                sampled - exact < 1e-2 * exact,
                "{sampled} far above {exact}"
            );
        }
    }
}
