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
use uom::si::{angle::radian, force::newton, length::meter, torque::newton_meter};

/// Relative tolerance below which a singular value, a face normal or an ACAI counts as zero.
const TOL: f64 = 1e-9;

/// The sense a rotor turns, seen from above.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Spin {
    Cw,
    Ccw,
}

impl Spin {
    pub fn id(self) -> &'static str {
        match self {
            Spin::Cw => "cw",
            Spin::Ccw => "ccw",
        }
    }
}

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

/// A tilt actuator: a unit hinge axis in body axes, the tilt either way from
/// the body's vertical, and the tilt it holds at hover (0 unless it holds a body tilt).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tilt {
    pub hinge: [f64; 3],
    pub range: Angle,
    pub held: Angle,
}

impl Tilt {
    /// A tilt actuator that holds none of its range at hover.
    pub fn new(hinge: [f64; 3], range: Angle) -> Tilt {
        Tilt {
            hinge,
            range,
            held: Angle::new::<radian>(0.0),
        }
    }

    /// The deflections left from the held tilt, as sines (the tilt columns' unit):
    /// sin(-range - held) to sin(range - held), each within a quarter turn (`statics`).
    pub fn bounds(&self) -> (f64, f64) {
        let quarter = std::f64::consts::FRAC_PI_2;
        let (range, held) = (self.range.get::<radian>(), self.held.get::<radian>());
        let lo = (-range - held).clamp(-quarter, quarter).sin();
        let hi = (range - held).clamp(-quarter, quarter).sin();
        (lo.min(hi), hi)
    }
}

/// The hinge angle that brings a rotor's thrust nearest the vertical when the body
/// is pitched nose down by `pitch` and the rotor may tilt back up to `up_to`:
/// atan2(-sin(pitch) h_y, cos(pitch)), within +-up_to (`statics`).
pub fn hold_angle(hinge: [f64; 3], pitch: Angle, up_to: Angle) -> Angle {
    let p = pitch.get::<radian>();
    let limit = up_to.get::<radian>().abs();
    let held = (-p.sin() * hinge[1]).atan2(p.cos());
    Angle::new::<radian>(if held.is_finite() {
        held.clamp(-limit, limit)
    } else {
        0.0
    })
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

/// A 4 x n matrix of the given columns; none gives a matrix of no columns.
fn of_columns(columns: &[Vector4<f64>]) -> Matrix4xX<f64> {
    Matrix4xX::from_fn(columns.len(), |r, c| columns[c][r])
}

/// The Euclidean length of `v`, scaled by its largest entry first so that the
/// squares neither overflow nor underflow.
fn length(v: &Vector4<f64>) -> f64 {
    let big = v.amax();
    if big > 0.0 && big.is_finite() {
        big * (v / big).norm()
    } else {
        big
    }
}

/// A column scaled to unit length, computed from its largest entry first so that
/// neither tiny nor huge entries under- or overflow; `None` for a zero column.
fn direction(c: &Vector4<f64>) -> Option<Vector4<f64>> {
    let big = c.amax();
    if !(big > 0.0 && big.is_finite()) {
        return None;
    }
    (c / big).try_normalize(0.0)
}

/// What one column of the effectiveness matrix is: a rotor's thrust or its tilt.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct Actuator {
    /// Index of the rotor in the placements' order, from 0.
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
        matrix: of_columns(&columns),
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
/// four) and its left singular vectors, `None` if an entry is not finite. The
/// matrix is first divided by its largest entry (which changes neither the
/// rank nor the singular vectors), so tiny and huge entries decompose alike;
/// a zero matrix has singular values 0 and the unit vectors. Up to four columns
/// the matrix is square and fixed in size, so the decomposition runs without the heap.
fn svd(m: &Matrix4xX<f64>) -> Option<([f64; 4], [Vector4<f64>; 4])> {
    if m.iter().any(|v| !v.is_finite()) {
        return None;
    }
    let big = m.amax();
    if big == 0.0 {
        return Some(([0.0; 4], std::array::from_fn(|j| Vector4::ith(j, 1.0))));
    }
    let m = m / big;
    let (sigma, u): (Vec<f64>, Matrix4<f64>) = if m.ncols() <= 4 {
        let mut square = Matrix4::zeros();
        square.columns_mut(0, m.ncols()).copy_from(&m);
        let svd = SVD::try_new(square, true, false, f64::EPSILON, 10_000)?;
        (svd.singular_values.iter().copied().collect(), svd.u?)
    } else {
        let svd = SVD::try_new(m, true, false, f64::EPSILON, 10_000)?;
        let u = svd.u?;
        (
            svd.singular_values.iter().copied().collect(),
            Matrix4::from_fn(|r, c| u[(r, c)]),
        )
    };
    Some((
        std::array::from_fn(|j| sigma.get(j).copied().unwrap_or(0.0) * big),
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
/// Each column is scaled to unit length first: that changes neither the rank nor
/// which rows depend on which, so the answer does not depend on the units or the
/// size of any one actuator (a tilt column per newton of a tiny hover thrust counts).
pub fn authority(b: &Matrix4xX<f64>) -> Authority {
    let columns: Vec<Vector4<f64>> = b
        .column_iter()
        .map(|c| direction(&c.into_owned()).unwrap_or_else(Vector4::zeros))
        .collect();
    let b = &of_columns(&columns);
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

/// Unit normal of the span of three unit columns in R^4 (signed 3x3 minors), if they are independent.
fn normal(a: Vector4<f64>, b: Vector4<f64>, c: Vector4<f64>) -> Option<Vector4<f64>> {
    // The rows left when row `skip` is struck out.
    const ROWS: [[usize; 3]; 4] = [[1, 2, 3], [0, 2, 3], [0, 1, 3], [0, 1, 2]];
    let minor = |skip: usize| {
        let rows = ROWS[skip];
        Matrix3::from_fn(|i, j| [a, b, c][j][rows[i]]).determinant()
    };
    let n = Vector4::new(minor(0), -minor(1), minor(2), -minor(3));
    (n.norm() > TOL).then(|| n.normalize())
}

/// [`normal`] of the three columns each scaled to unit length first (the span is
/// the same), so the test of independence does not depend on their sizes.
fn face_normal(a: &Vector4<f64>, b: &Vector4<f64>, c: &Vector4<f64>) -> Option<Vector4<f64>> {
    normal(direction(a)?, direction(b)?, direction(c)?)
}

/// ACAI: the signed distance from the hover point `g` to the boundary of the attainable
/// set {B u : lo <= u <= hi}, min over face normals xi of
/// sum_j |xi . b_j| (hi_j - lo_j) / 2 - |xi . (g - B (lo + hi) / 2)| (`du-2015`).
/// Faces are spanned by three independent generators (columns with hi > lo), or,
/// when the generators span less than R^4, lie across their left null space; with no
/// generator the set is one point and the index minus the hover point's distance to it.
/// NaN only when the entries are beyond what f64 holds.
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
                if let Some(xi) = face_normal(&gens[i].0, &gens[j].0, &gens[k].0) {
                    min = least(min, value(&xi));
                    faces += 1;
                }
            }
        }
    }
    // With three independent generators their normals already hold the left null
    // space (rank 3: the one normal; rank 4: none). Only below rank 3 does it take an
    // SVD to find the directions across which the set is flat.
    // With no generator at all the set is the one point `centre`: the hover point
    // is its distance from it outside (or on it).
    if gens.is_empty() {
        min = -length(&offset);
    } else if faces == 0 {
        let gen_matrix = of_columns(&gens.iter().map(|(c, r)| c * *r).collect::<Vec<_>>());
        if let Some((sigma, u)) = svd(&gen_matrix) {
            let scale = sigma.first().copied().unwrap_or(0.0);
            let rank = sigma.iter().filter(|&&v| v > TOL * scale).count();
            min = u[rank..].iter().map(value).fold(min, least);
        }
    }
    if !min.is_finite() {
        // Nothing bounded the index (entries beyond f64): no margin can be claimed.
        return f64::NAN;
    }
    // Snap round-off to the exact zero of a hover point on a face (e.g. a lost rotor, `du-2015`).
    let scale: f64 = gens.iter().map(|(c, r)| length(c) * r).sum::<f64>() + length(&offset);
    if min.abs() <= TOL * scale {
        0.0
    } else {
        min
    }
}

/// The lesser of two face values, NaN if either is (`f64::min` would drop a NaN
/// face silently and so overstate the index).
fn least(a: f64, b: f64) -> f64 {
    if a.is_nan() || b.is_nan() {
        f64::NAN
    } else {
        a.min(b)
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
                    if let Some(xi) = face_normal(&col(i), &col(j), &col(k)) {
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
    /// fixed), the others 0..T_max and tilting within [`Tilt::bounds`], linearised at W / n_alive
    /// (`du-2015`): the same value as [`acai`] on that matrix and those bounds.
    pub fn hover_acai(&self, placements: &[Placement], hover: &Hover, lost: &[usize]) -> f64 {
        let alive = placements.len() - lost.len().min(placements.len());
        let share = hover.weight.get::<newton>() / (alive.max(1) as f64);
        let tmax = hover.rotor_thrust.get::<newton>();
        let actuators = &self.unit.actuators;
        // Each column's scale (1 for thrust, the hover share for tilt) and bounds.
        let bounds = |a: &Actuator| {
            let scale = if a.tilt { share } else { 1.0 };
            let (lo, hi) = match (lost.contains(&a.rotor), a.tilt) {
                (true, _) => (0.0, 0.0),
                (false, false) => (0.0, tmax),
                (false, true) => placements[a.rotor].tilt.map_or((0.0, 0.0), |t| t.bounds()),
            };
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
            min = least(min, support - f.xi.dot(&offset).abs());
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
        if !min.is_finite() {
            return f64::NAN;
        }
        // Snap round-off to the exact zero of a hover point on a face (e.g. a lost rotor).
        let size: f64 = (0..b.ncols())
            .map(|j| length(&b.column(j).into_owned()) * half[j].0)
            .sum::<f64>()
            + length(&offset);
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

    fn mm(v: f64) -> Length {
        Length::new::<uom::si::length::millimeter>(v)
    }

    fn n(v: f64) -> Force {
        Force::new::<newton>(v)
    }

    fn deg(v: f64) -> Angle {
        Angle::new::<degree>(v)
    }

    /// Rotors on a ring as Du et al. 2015 place them: rotor i at azimuth
    /// `first` + i 360 / n deg clockwise from the nose, x = arm cos az, y = -arm sin az.
    fn ring(arm_mm: f64, first: f64, spins: &[Spin]) -> Vec<Placement> {
        let k = spins.len() as f64;
        spins
            .iter()
            .enumerate()
            .map(|(i, &spin)| {
                let az = (first + i as f64 * 360.0 / k).to_radians();
                Placement {
                    x: mm(arm_mm * az.cos()),
                    y: mm(-arm_mm * az.sin()),
                    z: mm(0.0),
                    spin,
                    tilt: None,
                }
            })
            .collect()
    }

    /// The same rotors raised `z_mm` above the centre of mass, each tilting
    /// +-`range` deg on a hinge along its arm (the unit vector from the centre to the hub).
    fn tilting(p: Vec<Placement>, range: f64, z_mm: f64) -> Vec<Placement> {
        p.into_iter()
            .map(|r| {
                let (x, y) = (r.x.get::<meter>(), r.y.get::<meter>());
                let l = x.hypot(y);
                Placement {
                    z: mm(z_mm),
                    tilt: Some(Tilt::new([x / l, y / l, 0.0], deg(range))),
                    ..r
                }
            })
            .collect()
    }

    /// Du et al. 2015 example hexacopter: m = 1.535 kg, g = 9.80, arm 0.275 m, 0..6.125 N, k = 0.1 m.
    fn du_hover() -> Hover {
        Hover {
            weight: n(1.535 * 9.80),
            rotor_thrust: n(6.125),
            torque_ratio: Length::new::<meter>(0.1),
        }
    }

    /// Du et al. 2015 example hexacopter: arm 0.275 m, rotor i at (i - 1) x 60 deg.
    fn hexacopter(spins: [Spin; 6]) -> Vec<Placement> {
        ring(275.0, 0.0, &spins)
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
        of_columns(&cols)
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
    fn du_2015_alternating_hexacopter_placed_on_its_ring_matches() {
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
        for first in [45.0, 0.0] {
            let quad = ring(275.0, first, &[P, N, P, N]);
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
        let pair = ring(70.0, 90.0, &[P, N]);
        let a = authority(&effectiveness(&pair, n(1.5), mm(3.0)).matrix);
        assert_eq!(a.rank, 2);
        assert_eq!(a.lacking, [Axis::Pitch, Axis::Yaw]);
        assert_eq!(a.unmoved, [Axis::Pitch]);
        assert_eq!(a.tied, [Axis::Roll, Axis::Yaw]);
    }

    #[test]
    fn two_tilting_rotors_command_pitch_only_through_their_height() {
        // DESIGN rule 5: a tilting rotor makes a pitch moment only through its height.
        let flat = tilting(ring(70.0, 90.0, &[P, N]), 30.0, 0.0);
        let a = authority(&effectiveness(&flat, n(1.5), mm(3.0)).matrix);
        assert_eq!(
            (a.rank, a.lacking.as_slice()),
            (3, [Axis::Pitch].as_slice())
        );

        let raised = tilting(ring(70.0, 90.0, &[P, N]), 30.0, 40.0);
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
        let (lo, hi): (Vec<f64>, Vec<f64>) = e
            .actuators
            .iter()
            .map(|a| match (lost.contains(&a.rotor), a.tilt) {
                (true, _) => (0.0, 0.0),
                (false, false) => (0.0, hover.rotor_thrust.get::<newton>()),
                (false, true) => p[a.rotor].tilt.map_or((0.0, 0.0), |t| t.bounds()),
            })
            .unzip();
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
        let mut octo = tilting(ring(300.0, 0.0, &[P, N, P, N, P, N, P, N]), 20.0, 50.0);
        // One rotor holding part of its range (as for a body tilt), so the bounds are uneven.
        if let Some(t) = octo[2].tilt.as_mut() {
            t.held = deg(-12.0);
        }
        let cases = [
            (
                octo,
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
        // Rotors at 60, 180 and 300 deg; the tail servo hinged along its arm (body x).
        let mut tri = ring(250.0, 60.0, &[P, P, N]);
        tri[1].tilt = Some(Tilt::new([-1.0, 0.0, 0.0], deg(30.0)));
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
    fn actuators_that_can_make_nothing_leave_the_hover_point_its_weight_away_and_never_panic() {
        // du-2015: the ACAI is the signed distance from the hover point G to the boundary of
        // the attainable set; with every bound 0..0 the set is the origin alone, so (by hand)
        // the distance is |G| = W, outside: ACAI = -W.
        let b = du_matrix([1.0, -1.0, 1.0, -1.0, 1.0, -1.0]);
        let g = Vector4::new(1.535 * 9.80, 0.0, 0.0, 0.0);
        assert_eq!(acai(&b, &[0.0; 6], &[0.0; 6], g), -1.535 * 9.80);
        assert_eq!(acai(&of_columns(&[]), &[], &[], g), -1.535 * 9.80);
        // Rotors with no thrust to give, through the reused faces as the rule calls them.
        let hover = Hover {
            rotor_thrust: n(0.0),
            ..du_hover()
        };
        let hex = hexacopter([P, N, P, N, P, N]);
        for lost in [vec![], vec![0], vec![0, 3]] {
            let v = hover_acai(&hex, &hover, &lost);
            assert!(v.is_finite() && v < 0.0, "{lost:?}: {v}");
        }
        // No rotors at all: a matrix of no columns, rank 0, every axis lacking.
        let none = effectiveness(&[], n(1.0), mm(1.0));
        assert_eq!(none.matrix.ncols(), 0);
        let a = authority(&none.matrix);
        assert_eq!((a.rank, a.lacking.len()), (0, 4));
        assert_eq!(authority(&Matrix4xX::zeros(3)).rank, 0);
    }

    #[test]
    fn the_acai_scales_with_the_forces_from_1e_minus_200_to_1e200() {
        // du-2015: the index is a support function less an offset, each linear in the
        // thrust bounds and the weight, so scaling every force by s scales it by s:
        // the paper's 1.4861 becomes 1.4861 s (torque ratio and arm unchanged).
        let hex = hexacopter([P, N, P, N, P, N]);
        for s in [1e-200, 1e-100, 1e-20, 1e20, 1e100, 1e200] {
            let hover = Hover {
                weight: n(1.535 * 9.80 * s),
                rotor_thrust: n(6.125 * s),
                torque_ratio: Length::new::<meter>(0.1),
            };
            let v = hover_acai(&hex, &hover, &[]);
            assert!((v / s - 1.4861).abs() < 1e-3, "x{s}: {v}");
            assert_eq!(hover_acai(&hex, &hover, &[2]), 0.0, "x{s}");
        }
    }

    #[test]
    fn an_index_beyond_what_f64_holds_is_nan_never_a_number_that_passes() {
        // du-2015 hexacopter with every force 1e308 / 6.125: by the scaling above the
        // index would be 1.4861 x that, 2.43e307, but the set's centre, six columns of
        // half thrust, overflows f64; the answer must then be NaN (the rule says it
        // cannot assess), not a face value that skipped the overflowing faces.
        let b = du_matrix([1.0, -1.0, 1.0, -1.0, 1.0, -1.0]);
        let s = 1e308 / 6.125;
        let g = Vector4::new(1.535 * 9.80 * s, 0.0, 0.0, 0.0);
        let v = acai(&b, &[0.0; 6], &[1e308; 6], g);
        assert!(v.is_nan() || (v / (1.4861 * s) - 1.0).abs() < 1e-3, "{v}");
        assert!(least(1.0, f64::NAN).is_nan() && least(f64::NAN, 1.0).is_nan());
        assert_eq!(least(1.0, -2.0), -2.0);
    }

    #[test]
    fn the_rank_does_not_depend_on_how_large_an_actuator_column_is() {
        // Linear algebra: B D has the rank of B for any invertible diagonal D, so a
        // tilting bicopter raised 40 mm commands all four axes at any hover thrust;
        // one shrunk to arms of 1e-300 mm gives a rank and as many lacking axes as it falls short.
        let raised = tilting(ring(70.0, 90.0, &[P, N]), 30.0, 40.0);
        for thrust in [1e-300, 1e-9, 1.0, 1e6] {
            let a = authority(&effectiveness(&raised, n(thrust), mm(3.0)).matrix);
            assert_eq!(a.rank, 4, "hover thrust {thrust} N");
        }
        let tiny = tilting(ring(1e-300, 90.0, &[P, N]), 30.0, 1e-300);
        let a = authority(&effectiveness(&tiny, n(1.0), mm(1e-300)).matrix);
        assert!(a.rank <= 4 && a.lacking.len() == 4 - a.rank);
    }

    #[test]
    fn a_hinge_along_body_y_holds_a_body_pitch_by_tilting_back_as_far() {
        // Statics by hand: a body pitched nose down by 20 deg has its thrust vertical
        // again when a rotor hinged about +y tilts -20 deg (about -y: +20 deg); a hinge
        // along x cannot help; a 15 deg stop holds only 15 deg.
        let pitch = deg(20.0);
        let held = |h: [f64; 3], up_to: f64| hold_angle(h, pitch, deg(up_to)).get::<degree>();
        assert!((held([0.0, 1.0, 0.0], 30.0) + 20.0).abs() < 1e-9);
        assert!((held([0.0, -1.0, 0.0], 30.0) - 20.0).abs() < 1e-9);
        assert_eq!(held([1.0, 0.0, 0.0], 30.0), 0.0);
        assert!((held([0.0, 1.0, 0.0], 15.0) + 15.0).abs() < 1e-9);
        // What is left for control: from -30 - (-20) = -10 deg to 30 + 20 = 50 deg.
        let t = Tilt {
            held: deg(-20.0),
            ..Tilt::new([0.0, 1.0, 0.0], deg(30.0))
        };
        let (lo, hi) = t.bounds();
        assert!((lo - (-10f64).to_radians().sin()).abs() < 1e-12, "{lo}");
        assert!((hi - 50f64.to_radians().sin()).abs() < 1e-12, "{hi}");
    }

    #[test]
    fn a_tilting_pair_that_spends_its_whole_range_on_a_body_tilt_has_no_authority_left() {
        // du-2015: a hover point on the boundary of the attainable set has ACAI 0 (it
        // cannot be pushed one way); a bicopter whose pitch comes from tilting alone,
        // with both rotors held at their stop, is there. Half the range held leaves less.
        let hover = Hover {
            weight: n(3.0),
            rotor_thrust: n(2.5),
            torque_ratio: mm(3.0),
        };
        let hold = |spent: f64| -> Vec<Placement> {
            tilting(ring(70.0, 90.0, &[P, N]), 30.0, 40.0)
                .into_iter()
                .map(|mut r| {
                    if let Some(t) = r.tilt.as_mut() {
                        t.held = hold_angle(t.hinge, deg(spent), t.range);
                    }
                    r
                })
                .collect()
        };
        let (free, half, all) = (
            hover_acai(&hold(0.0), &hover, &[]),
            hover_acai(&hold(15.0), &hover, &[]),
            hover_acai(&hold(30.0), &hover, &[]),
        );
        assert!(free > half && half > 0.0, "{free} {half}");
        assert!(all <= 0.0, "{all}");
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
        let raised = tilting(ring(70.0, 90.0, &[P, N]), 30.0, 40.0);
        let bicopter = effectiveness(&raised, n(1.5), mm(3.0)).matrix;
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
