//! Hybrid energies: an s,p hybrid sp^λ = (s + √λ p)/√(1+λ) on a centre whose one-centre
//! s and p functions are orthonormal has ⟨h|H|h⟩ = (ε_s + λ ε_p)/(1+λ), i.e. it lies a
//! fraction λ/(1+λ) of the s–p gap above ε_s (Coulson, *Valence*, 1952; the diagonal
//! extended Hückel elements ε_s = H_ss, ε_p = H_pp are the VSIPs).

/// ε(sp^λ) in the units of `eps_s` and `eps_p`; `None` is a pure p orbital (λ → ∞).
pub fn hybrid_energy(eps_s: f64, eps_p: f64, lambda: Option<f64>) -> f64 {
    let fraction = gap_fraction(lambda);
    eps_s + fraction * (eps_p - eps_s)
}

/// The fraction λ/(1+λ) of the s–p gap (the p share); 1 for a pure p orbital.
pub fn gap_fraction(lambda: Option<f64>) -> f64 {
    match lambda {
        Some(l) if l.is_finite() && l >= 0.0 => l / (1.0 + l),
        Some(_) | None => 1.0,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sp3_lies_three_quarters_up_the_gap() {
        // Coulson, Valence (1952): ε(sp^3) = (ε_s + 3 ε_p)/4.
        let (s, p) = (-26.0, -13.4);
        assert!((hybrid_energy(s, p, Some(3.0)) - (s + 3.0 * p) / 4.0).abs() < 1e-12);
        assert!((hybrid_energy(s, p, Some(0.0)) - s).abs() < 1e-12);
        assert!((hybrid_energy(s, p, None) - p).abs() < 1e-12);
        assert!((gap_fraction(Some(2.0)) - 2.0 / 3.0).abs() < 1e-12);
    }
}
