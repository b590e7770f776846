//! Generating functions of a degree distribution with a class-dependent
//! occupation, and the percolation fixed point (site + bond percolation on
//! the configuration model).
//!
//! Notation (Callaway, Newman, Strogatz & Watts 2000, PRL 85:5468; Newman
//! 2002, PRE 66:016128). p_k is the degree distribution, φ_k the
//! probability that a degree-k person is present (not immune; for a
//! vaccination v_k with all-or-nothing efficacy ε, φ_k = 1 − ε v_k), T the
//! probability that a contact transmits, ⟨k⟩ = Σ k p_k over everybody:
//!
//! - F0(x) = Σ_k p_k φ_k x^k,
//! - F1(x) = Σ_k k p_k φ_k x^{k−1} / ⟨k⟩ (φ ≡ 1 gives G0, G1).
//!
//! Let w be the probability that following one end of a random contact
//! does **not** lead to the giant component, counting the transmission
//! along that contact. The contact transmits with probability T; the
//! person at its end has degree k with probability k p_k/⟨k⟩, is absent
//! with probability 1 − φ_k, and if present leads to the giant unless all
//! k − 1 further contacts fail:
//!
//! ```text
//! w = 1 − T + T · [1 − F1(1) + F1(w)]                                (1)
//! ```
//!
//! Writing u = 1 − F1(1) + F1(w) (the same without the first contact's
//! coin) gives the brief's form u = 1 − F1(1) + F1(1 − T + T u), which for
//! φ ≡ 1 is Newman's u = G1(1 − T + T u). The giant fraction of the whole
//! population is S = F0(1) − F0(w) = Σ_k p_k φ_k (1 − w^k).
//!
//! w = 1 always solves (1). With g(w) = RHS − w convex on [0, 1], g(1) = 0
//! and g'(1) = T F1'(1) − 1, a root below 1 exists iff
//! R = T F1'(1) = T Σ k(k−1) p_k φ_k / ⟨k⟩ > 1 (this R is `r_eff`). It is
//! found by bracketing ([0, 1 − 2^{−j}] with the first j where g < 0) and a
//! safeguarded Newton iteration (a Newton step that leaves the bracket is
//! replaced by bisection).
//!
//! Small outbreaks: with H1(x) = 1 − T + T[1 − F1(1) + x F1(H1(x))] and
//! H0(x) = 1 − F0(1) + x F0(H1(x)), the expected size of a finite
//! outbreak started by a random person (0 when the giant is hit or the
//! person is absent) is H0'(1) = F0(w) + F0'(w) · T F1(w)/(1 − T F1'(w))
//! (Newman 2002, eqs. for ⟨s⟩; below threshold w = 1 and for Poisson this
//! is 1 + cT/(1 − cT)).

use super::DegreeDistribution;

/// The present mass p_k φ_k per degree, and ⟨k⟩ of the whole population.
#[derive(Clone, Debug, PartialEq)]
pub struct Occupation {
    /// Distinct degrees, ascending.
    pub degrees: Vec<u32>,
    /// p_k φ_k for each degree.
    pub present: Vec<f64>,
    /// ⟨k⟩ of the population before removal (present or not).
    pub mean_degree: f64,
}

/// The solution of the fixed point (1) at one transmissibility.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FixedPoint {
    /// w: probability that a contact end does not lead to the giant
    /// (including that contact's transmission coin); 1 below threshold.
    pub w: f64,
    /// u = 1 − F1(1) + F1(w): the same, given the contact transmitted.
    pub u: f64,
    /// S = F0(1) − F0(w): giant fraction of the whole population.
    pub giant_fraction: f64,
    /// H0'(1): expected size (in people) of a finite outbreak from a
    /// random person; infinite exactly at threshold.
    pub small_outbreak_mean: f64,
    /// R = T F1'(1).
    pub r_eff: f64,
}

#[inline]
fn pow(x: f64, n: u32) -> f64 {
    if n <= i32::MAX as u32 {
        x.powi(n as i32)
    } else {
        x.powf(f64::from(n))
    }
}

impl Occupation {
    /// Everybody present (φ ≡ 1).
    pub fn everyone(dist: &DegreeDistribution) -> Self {
        Occupation {
            degrees: dist.support().to_vec(),
            present: dist.probabilities().to_vec(),
            mean_degree: dist.mean(),
        }
    }

    /// Present fraction `phi[c]` for each class `c` of
    /// [`DegreeDistribution::classes`], aggregated per degree.
    pub fn from_class_phi(dist: &DegreeDistribution, phi: &[f64]) -> Self {
        let mut present = vec![0.0; dist.support().len()];
        let mut j = 0;
        for (c, f) in dist.classes().iter().zip(phi) {
            while dist.support()[j] != c.degree {
                j += 1;
            }
            present[j] += c.prob * f.clamp(0.0, 1.0);
        }
        Occupation { degrees: dist.support().to_vec(), present, mean_degree: dist.mean() }
    }

    /// F0(x) = Σ p_k φ_k x^k.
    pub fn f0(&self, x: f64) -> f64 {
        self.degrees.iter().zip(&self.present).map(|(&k, &m)| m * pow(x, k)).sum()
    }

    /// F0'(x) = Σ k p_k φ_k x^{k−1}.
    pub fn f0_prime(&self, x: f64) -> f64 {
        self.degrees
            .iter()
            .zip(&self.present)
            .filter(|(&k, _)| k > 0)
            .map(|(&k, &m)| f64::from(k) * m * pow(x, k - 1))
            .sum()
    }

    /// F1(x) = F0'(x)/⟨k⟩ (0 when ⟨k⟩ = 0).
    pub fn f1(&self, x: f64) -> f64 {
        if self.mean_degree > 0.0 {
            self.f0_prime(x) / self.mean_degree
        } else {
            0.0
        }
    }

    /// F1'(x) = Σ k(k−1) p_k φ_k x^{k−2}/⟨k⟩.
    pub fn f1_prime(&self, x: f64) -> f64 {
        if self.mean_degree <= 0.0 {
            return 0.0;
        }
        self.degrees
            .iter()
            .zip(&self.present)
            .filter(|(&k, _)| k > 1)
            .map(|(&k, &m)| f64::from(k) * f64::from(k - 1) * m * pow(x, k - 2))
            .sum::<f64>()
            / self.mean_degree
    }

    /// R = T F1'(1) = T Σ k(k−1) p_k φ_k/⟨k⟩: the mean number of further
    /// transmissions from a person reached along a contact (Callaway et
    /// al. 2000; Newman 2002). The outbreak can be large iff R > 1.
    pub fn r_eff(&self, t: f64) -> f64 {
        t * self.f1_prime(1.0)
    }

    /// T_c = 1/F1'(1), the transmissibility at which R = 1 (may exceed 1:
    /// then no T ≤ 1 gives a large outbreak); `None` when F1'(1) = 0.
    pub fn critical_transmissibility(&self) -> Option<f64> {
        let d = self.f1_prime(1.0);
        (d > 0.0).then(|| 1.0 / d)
    }

    /// Solves (1) at transmissibility `t` (module docs).
    ///
    /// ```
    /// use spreadplan::degree::{pgf::Occupation, DegreeDistribution};
    /// // Erdős–Rényi c = 2, T = 1: S = 1 − e^{−2S} → S = 0.79681 (Newman 2002).
    /// let d = DegreeDistribution::from_spec("poisson:mean=2").unwrap();
    /// let s = Occupation::everyone(&d).solve(1.0).giant_fraction;
    /// assert!((s - 0.796812).abs() < 1e-6);
    /// ```
    pub fn solve(&self, t: f64) -> FixedPoint {
        let t = t.clamp(0.0, 1.0);
        let f1_1 = self.f1(1.0);
        let g = |w: f64| 1.0 - t + t * (1.0 - f1_1 + self.f1(w)) - w;
        let dg = |w: f64| t * self.f1_prime(w) - 1.0;
        let r = self.r_eff(t);
        let mut w = 1.0;
        if r > 1.0 {
            // Bracket: g(0) >= 0; find hi < 1 with g(hi) < 0.
            let mut hi = None;
            for j in 1..=60 {
                let x = 1.0 - 0.5f64.powi(j);
                if g(x) < 0.0 {
                    hi = Some(x);
                    break;
                }
            }
            if let Some(mut hi) = hi {
                let mut lo = 0.0;
                if g(lo) <= 0.0 {
                    w = 0.0;
                } else {
                    let mut x = 0.5 * (lo + hi);
                    for _ in 0..200 {
                        let gx = g(x);
                        if gx > 0.0 {
                            lo = x;
                        } else {
                            hi = x;
                        }
                        let d = dg(x);
                        let newton = x - gx / d;
                        let next = if d < 0.0 && newton > lo && newton < hi {
                            newton
                        } else {
                            0.5 * (lo + hi)
                        };
                        if (next - x).abs() <= 1e-16 || hi - lo <= 1e-16 {
                            x = next;
                            break;
                        }
                        x = next;
                    }
                    w = x;
                }
            }
        }
        let u = 1.0 - f1_1 + self.f1(w);
        let giant = (self.f0(1.0) - self.f0(w)).max(0.0);
        let denom = 1.0 - t * self.f1_prime(w);
        let small = if denom > 0.0 {
            self.f0(w) + self.f0_prime(w) * t * self.f1(w) / denom
        } else {
            f64::INFINITY
        };
        FixedPoint { w, u, giant_fraction: giant, small_outbreak_mean: small, r_eff: r }
    }
}

impl DegreeDistribution {
    /// G0(x) = Σ p_k x^k (Newman, Strogatz & Watts 2001).
    pub fn g0(&self, x: f64) -> f64 {
        Occupation::everyone(self).f0(x)
    }

    /// G0'(x).
    pub fn g0_prime(&self, x: f64) -> f64 {
        Occupation::everyone(self).f0_prime(x)
    }

    /// G1(x) = G0'(x)/G0'(1), the excess-degree generating function.
    pub fn g1(&self, x: f64) -> f64 {
        Occupation::everyone(self).f1(x)
    }

    /// G1'(x).
    pub fn g1_prime(&self, x: f64) -> f64 {
        Occupation::everyone(self).f1_prime(x)
    }

    /// Bond percolation with occupation probability `t` and nobody removed:
    /// u = G1(1 − t + t u), S = 1 − G0(1 − t + t u) (Newman 2002).
    ///
    /// ```
    /// let d = spreadplan::degree::DegreeDistribution::from_spec("regular:k=3").unwrap();
    /// // Bethe lattice k = 3: threshold T_c = 1/(k − 1) = 0.5.
    /// assert_eq!(d.bond_percolation(0.5).giant_fraction, 0.0);
    /// assert!(d.bond_percolation(0.6).giant_fraction > 0.0);
    /// ```
    pub fn bond_percolation(&self, t: f64) -> FixedPoint {
        Occupation::everyone(self).solve(t)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn poisson_small_outbreak_mean() {
        // Newman 2002: below threshold ⟨s⟩ = 1 + cT/(1 − cT); c = 3.5, T = 0.2 → 3.3333.
        let d = DegreeDistribution::from_spec("poisson:mean=3.5").unwrap();
        let fp = d.bond_percolation(0.2);
        assert_eq!(fp.giant_fraction, 0.0);
        assert!((fp.small_outbreak_mean - 10.0 / 3.0).abs() < 1e-9);
    }

    #[test]
    fn near_threshold_root() {
        let d = DegreeDistribution::from_spec("poisson:mean=1").unwrap();
        // S = 1 − exp(−cTS) with cT = 1.01: S ≈ 2(cT − 1) for cT → 1+.
        let fp = d.bond_percolation(1.0);
        assert_eq!(fp.giant_fraction, 0.0);
        let d = DegreeDistribution::from_spec("poisson:mean=1.01").unwrap();
        let fp = d.bond_percolation(1.0);
        let s = fp.giant_fraction;
        assert!(
            (s - (1.0 - (-1.01 * s).exp())).abs() < 1e-12 && s > 0.0193 && s < 0.0199,
            "{s} {fp:?}"
        );
    }
}
