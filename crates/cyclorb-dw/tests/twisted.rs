//! The twisted theories D^{ω_p}(Z_N): relations of the monomial generators, their
//! sensitivity to the integer representatives, and the genus-1 twist against the topological
//! spins of the anyons.
//!
//! Sources: the cocycle ω_p and the spins θ_(a,n) = exp(2πi (a n / N + p a² / N²)) of
//! D^{ω_p}(Z_N) (Dijkgraaf–Witten, Comm. Math. Phys. 129 (1990); de Wild Propitius, PhD
//! thesis, Amsterdam 1995, ch. 3; formulas from memory); the relations of the mapping class
//! group (Humphries 1979; Farb–Margalit, A Primer on Mapping Class Groups, ch. 3–5 and 9).

use cyclorb_dw::{
    builtin_group, check_twisted_relations, relation_checks, CyclicCocycle, FlatBundles,
    PhasedPermutation, SizeBound, TwistAction, TwistedBundles,
};
use cyclorb_field::CyclotomicField;
use cyclorb_mcg::{Curve, GeneratingSet};

fn space(n: u32, genus: usize) -> FlatBundles {
    let g = builtin_group(&format!("Z{n}")).unwrap();
    FlatBundles::new(&g, genus, SizeBound::default()).unwrap()
}

fn failures(checks: &[cyclorb_dw::RelationCheck]) -> Vec<String> {
    checks
        .iter()
        .filter(|c| !c.ok)
        .map(|c| c.name.clone())
        .collect()
}

#[test]
fn relations_hold_for_every_cocycle() {
    // the dimension is N^{2g}, the Verlinde dimension of N² anyons of dimension 1 and total
    // dimension N (standard)
    for n in 2..=5u32 {
        for genus in 1..=2 {
            let x = space(n, genus);
            assert_eq!(x.len(), (n as usize).pow(2 * genus as u32));
            for p in 0..n {
                let cocycle = CyclicCocycle::new(n, p).unwrap();
                let checks = check_twisted_relations(&x, &cocycle).unwrap();
                assert!(
                    failures(&checks).is_empty(),
                    "N = {n}, p = {p}, genus {genus}: {:?}",
                    failures(&checks)
                );
            }
        }
    }
    // genus 3: γ₀ and γ₁ commute, the 4-chain closes
    for n in [2, 3] {
        let x = space(n, 3);
        let checks = check_twisted_relations(&x, &CyclicCocycle::new(n, 1).unwrap()).unwrap();
        assert!(failures(&checks).is_empty(), "N = {n}");
        assert!(checks.iter().any(|c| c.name == "commute gamma0 gamma1"));
    }
}

/// A phase exponent as a function of the source state's residues, N and p.
type PhaseRule = fn(&[u16], u32, u32) -> u32;

/// The twisted action with the phases of one curve replaced by `naive`.
struct Naive<'a> {
    twisted: TwistedBundles<'a>,
    space: &'a FlatBundles,
    curve: Curve,
    naive: PhaseRule,
    cocycle: CyclicCocycle,
}

impl TwistAction for Naive<'_> {
    type Element = PhasedPermutation;
    fn genus(&self) -> usize {
        self.twisted.genus()
    }
    fn twist(&self, curve: Curve) -> Result<PhasedPermutation, cyclorb_dw::DwError> {
        let mut m = self.twisted.twist(curve)?;
        if curve == self.curve {
            let (n, p) = (self.cocycle.order(), self.cocycle.level());
            for (phase, &j) in m.phases.iter_mut().zip(&m.perm) {
                *phase = (self.naive)(self.space.state(j as usize), n, p) % (n * n);
            }
        }
        Ok(m)
    }
    fn separating(
        &self,
        handles: std::ops::Range<usize>,
    ) -> Result<PhasedPermutation, cyclorb_dw::DwError> {
        self.twisted.separating(handles)
    }
    fn product(&self, word: &[&PhasedPermutation]) -> PhasedPermutation {
        self.twisted.product(word)
    }
    fn same(&self, x: &PhasedPermutation, y: &PhasedPermutation) -> bool {
        self.twisted.same(x, y)
    }
    fn closed_surface(&self) -> bool {
        true
    }
    fn suffix(&self) -> &'static str {
        ""
    }
}

#[test]
fn naive_representatives_break_the_relations() {
    // β with ζ^{−p B̃²} alone (no carry term), and γ with the reduced difference
    // [Ã₁ − Ã₀]_N: both fail the braid relations for N = 3 (the derivation in
    // docs/dijkgraaf-witten.md needs the carry and the integer difference)
    let cases: [(usize, Curve, PhaseRule, &str); 2] = [
        (
            1,
            Curve::Beta(0),
            |s, n, p| n * n - (p * u32::from(s[1]).pow(2)) % (n * n),
            "braid alpha0 beta0",
        ),
        (
            2,
            Curve::Gamma(0),
            |s, n, p| p * ((u32::from(s[2]) + n - u32::from(s[0])) % n).pow(2),
            "braid beta0 gamma0",
        ),
    ];
    for (genus, curve, naive, relation) in cases {
        let x = space(3, genus);
        let cocycle = CyclicCocycle::new(3, 1).unwrap();
        let action = Naive {
            twisted: TwistedBundles::new(&x, &cocycle).unwrap(),
            space: &x,
            curve,
            naive,
            cocycle: cocycle.clone(),
        };
        let failed = failures(&relation_checks(&action).unwrap());
        assert!(failed.iter().any(|f| f == relation), "{curve}: {failed:?}");
        // and the true phases pass the same checks
        let right = relation_checks(&action.twisted).unwrap();
        assert!(failures(&right).is_empty());
    }
}

#[test]
fn genus_one_twist_has_the_anyon_spins() {
    // T_α on V_1 has the eigenvalues θ_(a,n) = ζ_{N²}^{N a n + p a²} of the N² anyons
    // (normalised by the vacuum, θ = 1, as the generator is: it fixes A = 0 without phase).
    // The eigenvalues agree when tr T_α^k = Σ θ^k for k = 1, …, N² (Newton's identities).
    for (n, p) in [(2, 1), (3, 1), (3, 2), (4, 1), (4, 3), (5, 2)] {
        let x = space(n, 1);
        let cocycle = CyclicCocycle::new(n, p).unwrap();
        let action = TwistedBundles::new(&x, &cocycle).unwrap();
        let alpha = action.twist(Curve::Alpha(0)).unwrap();
        let m = n * n;
        let field = CyclotomicField::new(m).unwrap();
        let mut power = PhasedPermutation::plain((0..x.len() as u32).collect());
        for k in 1..=m {
            power = action.product(&[&power, &alpha]);
            let fixed: Vec<_> = (0..x.len())
                .filter(|&i| power.perm[i] == i as u32)
                .map(|i| field.zeta_pow(i64::from(power.phases[i])))
                .collect();
            let trace = field.sum(fixed.iter()).unwrap();
            let spins: Vec<_> = (0..n)
                .flat_map(|a| (0..n).map(move |b| (a, b)))
                .map(|(a, b)| field.zeta_pow(i64::from(k * (n * a * b + p * a * a))))
                .collect();
            assert_eq!(
                trace,
                field.sum(spins.iter()).unwrap(),
                "N = {n}, p = {p}, k = {k}"
            );
        }
    }
}

#[test]
fn twisted_generators_need_the_cyclic_group() {
    // S₃ is not Z_N: the phases are refused (no outside value: a guard of this crate)
    let g = builtin_group("S3").unwrap();
    let x = FlatBundles::new(&g, 1, SizeBound::default()).unwrap();
    let cocycle = CyclicCocycle::new(6, 1).unwrap();
    assert!(TwistedBundles::new(&x, &cocycle).is_err());
    assert!(CyclicCocycle::new(3, 3).is_err());
    // the generators of the Humphries set at genus 2 are α₀, α₁, β₀, β₁, γ₀
    let x = space(2, 2);
    let c = CyclicCocycle::new(2, 1).unwrap();
    let gens = TwistedBundles::new(&x, &c)
        .unwrap()
        .generators(GeneratingSet::Humphries)
        .unwrap();
    assert_eq!(gens.len(), 5);
}
