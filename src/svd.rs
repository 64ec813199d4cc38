//! The singular-value decomposition of a small dense matrix by one-sided Jacobi rotations, in
//! place and without allocation.
//!
//! # Method
//! Hestenes' one-sided Jacobi method (M. R. Hestenes, J. SIAM 6, 1958; in the form of
//! J. Demmel and K. Veselić, SIAM J. Matrix Anal. Appl. 13, 1992; both from memory): plane
//! rotations applied to pairs of columns of `A` (rows × k) until every pair is orthogonal to
//! working precision. Then `A V = W` with `V` orthogonal (the product of the rotations) and the
//! columns of `W` mutually orthogonal: `W = U Σ`, the singular values are the column norms of `W`
//! and `A = W Vᵀ`. No `U` is formed: the least-squares solution needs only `W` and `V`.
//!
//! One rotation of the pair `(p, q)` with `α = ‖a_p‖²`, `β = ‖a_q‖²`, `γ = a_p·a_q`:
//! `ζ = (β − α)/(2γ)`, `t = sign(ζ)/(|ζ| + √(1 + ζ²))`, `c = 1/√(1 + t²)`, `s = c t`; the norms
//! update as `α' = α − t γ`, `β' = β + t γ`. A pair counts as orthogonal when
//! `|γ| ≤ ε √rows · √(α β)`; the sweep that rotates no pair ends the decomposition.
//!
//! # Promised accuracy
//! Backward stable: the computed `W Vᵀ` is `A + E` with `‖E‖ ≤ c · rows · ε · ‖A‖` (c a small
//! constant), so each singular value is within that of the exact one (Weyl), and the relative
//! error of `σ_i` is bounded by `c · rows · ε · σ_max/σ_i`. The checks suite tests this bound in
//! `f32` against `f64` and the `f64` result against nalgebra's SVD.
//!
//! # Cost
//! Per sweep and pair, one pass of three products over the rows only at the start of the sweep
//! (the norms), then one dot product and, when the pair is not yet orthogonal, two rotations (of
//! `A`'s and of `V`'s columns). A handful of sweeps (quadratic convergence): the count is reported.

use crate::{Error, Real};

/// Sweeps after which the decomposition gives up with [`Error::NotConverged`] (quadratic
/// convergence needs fewer than ten for the matrices of a steering loop).
pub(crate) const MAX_SWEEPS: u32 = 30;

/// Orthogonalises the columns `a[j][..rows]` (j < k = `a.len()`) in place and writes `V` (k × k,
/// column `j` in `v[j][..k]`) and the singular values (the final column norms) into `s[..k]`.
/// Returns the number of sweeps.
///
/// Edges: zero columns stay zero (their singular value is 0); `k = 0` or `rows = 0` is a
/// decomposition with nothing in it.
///
/// # Errors
/// [`Error::OutOfBounds`] when `v` or `s` has fewer than `k` entries or a column is shorter than
/// `rows` (or `v[j]` than `k`); [`Error::NonFinite`] for a non-finite entry; [`Error::Overflow`]
/// when a sum of squares overflows (scale the matrix first); [`Error::NotConverged`] after
/// [`MAX_SWEEPS`] sweeps.
pub(crate) fn try_decompose<T, A, V>(
    a: &mut [A],
    rows: usize,
    v: &mut [V],
    s: &mut [T],
) -> Result<u32, Error>
where
    T: Real,
    A: AsRef<[T]> + AsMut<[T]>,
    V: AsRef<[T]> + AsMut<[T]>,
{
    let k = a.len();
    if v.len() < k || s.len() < k {
        return Err(Error::OutOfBounds);
    }
    for (j, col) in v.iter_mut().take(k).enumerate() {
        let col = col.as_mut().get_mut(..k).ok_or(Error::OutOfBounds)?;
        for (i, x) in col.iter_mut().enumerate() {
            *x = if i == j { T::ONE } else { T::ZERO };
        }
    }
    for (col, norm) in a.iter_mut().zip(s.iter_mut()) {
        let col = col.as_mut().get(..rows).ok_or(Error::OutOfBounds)?;
        if !col.iter().all(|x| x.is_finite()) {
            return Err(Error::NonFinite);
        }
        *norm = T::ZERO;
    }
    let tol = T::EPSILON * T::from_u32(u32::try_from(rows).unwrap_or(u32::MAX)).sqrt();
    for sweep in 1..=MAX_SWEEPS {
        // Norms afresh at every sweep, so the updates α' = α − tγ cannot drift.
        for (col, norm) in a.iter().zip(s.iter_mut()) {
            *norm = dot(col.as_ref(), col.as_ref(), rows);
            if !norm.is_finite() {
                return Err(Error::Overflow);
            }
        }
        let mut rotated = false;
        for p in 0..k {
            let (left, right) = a.split_at_mut(p + 1);
            let (vl, vr) = v.split_at_mut(p + 1);
            let (sl, sr) = s.split_at_mut(p + 1);
            let (Some(ap), Some(vp), Some(alpha)) = (left.last_mut(), vl.last_mut(), sl.last_mut())
            else {
                continue;
            };
            for ((aq, vq), beta) in right.iter_mut().zip(vr.iter_mut()).zip(sr.iter_mut()) {
                if *alpha == T::ZERO || *beta == T::ZERO {
                    continue;
                }
                let gamma = dot(ap.as_ref(), aq.as_ref(), rows);
                if gamma.abs() <= tol * alpha.sqrt() * beta.sqrt() {
                    continue;
                }
                rotated = true;
                let zeta = (*beta - *alpha) / (gamma + gamma);
                let az = zeta.abs();
                // √(1 + ζ²) without overflow for a huge ζ.
                let root = if az > T::ONE {
                    az * (T::ONE + (T::ONE / az) * (T::ONE / az)).sqrt()
                } else {
                    (T::ONE + az * az).sqrt()
                };
                let t = T::ONE.copysign(zeta) / (az + root);
                let c = T::ONE / (T::ONE + t * t).sqrt();
                let sn = c * t;
                rotate(ap.as_mut(), aq.as_mut(), rows, c, sn);
                rotate(vp.as_mut(), vq.as_mut(), k, c, sn);
                *alpha -= t * gamma;
                *beta += t * gamma;
            }
        }
        if !rotated {
            for (col, norm) in a.iter().zip(s.iter_mut()) {
                *norm = dot(col.as_ref(), col.as_ref(), rows).sqrt();
            }
            return Ok(sweep);
        }
    }
    Err(Error::NotConverged)
}

/// `Σ x_i y_i` over the first `n` entries (fewer if a slice is shorter), two at a time into two
/// partial sums (half the loop's bookkeeping on a chip).
#[inline]
pub(crate) fn dot<T: Real>(x: &[T], y: &[T], n: usize) -> T {
    let n = n.min(x.len()).min(y.len());
    let (x, y) = (x.get(..n).unwrap_or(&[]), y.get(..n).unwrap_or(&[]));
    let (x2, y2) = (x.chunks_exact(2), y.chunks_exact(2));
    let (rx, ry) = (x2.remainder(), y2.remainder());
    let (mut s0, mut s1) = (T::ZERO, T::ZERO);
    for (a, b) in x2.zip(y2) {
        if let ([a0, a1], [b0, b1]) = (a, b) {
            s0 += *a0 * *b0;
            s1 += *a1 * *b1;
        }
    }
    for (a, b) in rx.iter().zip(ry) {
        s0 += *a * *b;
    }
    s0 + s1
}

/// `(x, y) ← (c x − s y, s x + c y)` over the first `n` entries, two at a time.
#[inline]
fn rotate<T: Real>(x: &mut [T], y: &mut [T], n: usize, c: T, s: T) {
    let n = n.min(x.len()).min(y.len());
    let (Some(x), Some(y)) = (x.get_mut(..n), y.get_mut(..n)) else {
        return;
    };
    let mut x2 = x.chunks_exact_mut(2);
    let mut y2 = y.chunks_exact_mut(2);
    for (a, b) in (&mut x2).zip(&mut y2) {
        if let ([a0, a1], [b0, b1]) = (a, b) {
            let (p0, q0, p1, q1) = (*a0, *b0, *a1, *b1);
            *a0 = c * p0 - s * q0;
            *b0 = s * p0 + c * q0;
            *a1 = c * p1 - s * q1;
            *b1 = s * p1 + c * q1;
        }
    }
    for (a, b) in x2.into_remainder().iter_mut().zip(y2.into_remainder()) {
        let (p, q) = (*a, *b);
        *a = c * p - s * q;
        *b = s * p + c * q;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A 3 × 2 matrix with known singular values: columns (3, 0, 4) and (0, 2, 0) are already
    /// orthogonal, so σ = (5, 2) and V = I after one sweep.
    #[test]
    fn orthogonal_columns_take_one_sweep() {
        let mut a = [[3.0_f64, 0.0, 4.0], [0.0, 2.0, 0.0]];
        let mut v = [[0.0; 2]; 2];
        let mut s = [0.0; 2];
        assert_eq!(try_decompose(&mut a, 3, &mut v, &mut s), Ok(1));
        assert_eq!(s, [5.0, 2.0]);
        assert_eq!(v, [[1.0, 0.0], [0.0, 1.0]]);
    }

    /// [[1, 1], [0, 1]] has σ = (1 ± √5)/2 ... the golden ratio φ and 1/φ (exact: σ₁σ₂ = |det| = 1,
    /// σ₁² + σ₂² = 3).
    #[test]
    fn two_by_two_golden() {
        let mut a = [[1.0_f64, 0.0], [1.0, 1.0]];
        let mut v = [[0.0; 2]; 2];
        let mut s = [0.0; 2];
        try_decompose(&mut a, 2, &mut v, &mut s).unwrap();
        let (hi, lo) = (s[0].max(s[1]), s[0].min(s[1]));
        let phi = (1.0 + 5.0_f64.sqrt()) / 2.0;
        assert!((hi - phi).abs() < 4.0 * f64::EPSILON);
        assert!((lo - 1.0 / phi).abs() < 4.0 * f64::EPSILON);
    }

    #[test]
    fn edges() {
        let mut a = [[f32::NAN, 0.0]];
        let mut v = [[0.0_f32; 1]; 1];
        let mut s = [0.0_f32; 1];
        assert_eq!(
            try_decompose(&mut a, 2, &mut v, &mut s),
            Err(Error::NonFinite)
        );
        let mut a = [[1.0e30_f32, 1.0e30]];
        assert_eq!(
            try_decompose(&mut a, 2, &mut v, &mut s),
            Err(Error::Overflow)
        );
        let mut a = [[1.0_f32, 0.0]];
        assert_eq!(
            try_decompose(&mut a, 3, &mut v, &mut s),
            Err(Error::OutOfBounds)
        );
        let mut a = [[0.0_f32; 2]; 2];
        assert_eq!(
            try_decompose(&mut a, 2, &mut v, &mut s),
            Err(Error::OutOfBounds)
        );
        let mut v = [[0.0_f32; 2]; 2];
        let mut s = [0.0_f32; 2];
        assert_eq!(try_decompose(&mut a, 2, &mut v, &mut s), Ok(1));
        assert_eq!(s, [0.0, 0.0]);
        let mut none: [[f32; 2]; 0] = [];
        assert_eq!(try_decompose(&mut none, 2, &mut v, &mut s), Ok(1));
    }
}
