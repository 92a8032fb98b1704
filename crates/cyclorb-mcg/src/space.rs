//! The genus-g block space of a theory: comb basis, invariant form and Dehn twists.

use cyclorb_field::Cyc;
use cyclorb_matrix::{GeneratorSet, Operator};
use cyclorb_theory::Theory;

use crate::alpha::alpha_twist;
use crate::basis::{CombBasis, CombState};
use crate::beta::beta_twist;
use crate::curves::{Curve, GeneratingSet};
use crate::error::McgError;
use crate::estimate::SpaceEstimate;
use crate::form::invariant_form;
use crate::gamma::gamma_twist;

/// V_g for one theory: the comb basis, the diagonal invariant Hermitian form G, and the
/// Dehn twists about the curves of docs/genus-g.md §2.
#[derive(Clone, Debug)]
pub struct BlockSpace {
    theory: Theory,
    basis: CombBasis,
    form: Vec<Cyc>,
}

impl BlockSpace {
    /// Build V_g (g ≥ 1), after checking its estimated size ([`SpaceEstimate`]) against the
    /// memory budget. Genus ≥ 2 needs F- and R-symbols; genus 1 needs only S and T
    /// when the theory has no F-symbols (then only α and β twists exist, from S and T).
    pub fn new(theory: Theory, genus: usize) -> Result<BlockSpace, McgError> {
        if genus >= 2 && !theory.has_fr() {
            return Err(McgError::NoFusionData {
                theory: theory.name().to_string(),
                genus,
            });
        }
        let size = SpaceEstimate::new(&theory, genus);
        cyclorb_field::check_budget(
            || {
                format!(
                    "the genus-{genus} block space of {} (dimension {})",
                    theory.name(),
                    size.dimension
                )
            },
            u64::try_from(size.bytes).unwrap_or(u64::MAX),
        )?;
        let basis = CombBasis::new(&theory, genus)?;
        let form = if theory.has_fr() {
            invariant_form(&theory, &basis)?
        } else {
            vec![theory.field().one(); basis.dimension()]
        };
        Ok(BlockSpace {
            theory,
            basis,
            form,
        })
    }

    /// The theory.
    pub fn theory(&self) -> &Theory {
        &self.theory
    }

    /// The genus g.
    pub fn genus(&self) -> usize {
        self.basis.genus()
    }

    /// dim V_g.
    pub fn dimension(&self) -> usize {
        self.basis.dimension()
    }

    /// The comb basis vectors.
    pub fn states(&self) -> &[CombState] {
        self.basis.states()
    }

    /// The comb basis.
    pub fn basis(&self) -> &CombBasis {
        &self.basis
    }

    /// The diagonal of the invariant Hermitian form G.
    pub fn form(&self) -> &[Cyc] {
        &self.form
    }

    /// The Dehn twist about one curve, in its sparse form.
    pub fn twist(&self, curve: Curve) -> Result<Operator, McgError> {
        let g = self.genus();
        let h = match curve {
            Curve::Alpha(h) | Curve::Beta(h) => h,
            Curve::Gamma(h) => h + 1,
        };
        if h >= g {
            return Err(McgError::Genus(g));
        }
        match curve {
            Curve::Alpha(h) => Ok(alpha_twist(&self.theory, &self.basis, h)),
            Curve::Beta(h) if self.theory.has_fr() => beta_twist(&self.theory, &self.basis, h),
            Curve::Beta(_) => crate::modular::beta_from_modular_data(&self.theory),
            Curve::Gamma(h) => gamma_twist(&self.theory, &self.basis, h),
        }
    }

    /// The twists of a generating set, with their curves.
    pub fn generators(&self, set: GeneratingSet) -> Result<Vec<(Curve, Operator)>, McgError> {
        set.curves(self.genus())
            .into_iter()
            .map(|c| Ok((c, self.twist(c)?)))
            .collect()
    }

    /// Twists of this space as a [`GeneratorSet`]: named by their curves, with the comb
    /// basis labels, the invariant form (omitted when every entry is 1) and the theory and
    /// genus recorded.
    pub fn generator_set(&self, twists: &[(Curve, Operator)]) -> Result<GeneratorSet, McgError> {
        let named = twists
            .iter()
            .map(|(c, op)| (c.to_string(), op.clone()))
            .collect();
        let unit_form = self.form.iter().all(|g| g.is_one());
        let labels = self.states().iter().map(|s| s.describe(&self.theory));
        let set = GeneratorSet::new(self.theory.field().clone(), named)?
            .with_form((!unit_form).then(|| self.form.clone()))?
            .with_basis_labels(labels.collect())?;
        Ok(set.with_origin(
            Some(self.theory.name().to_string()),
            Some(self.genus() as u32),
        ))
    }
}

#[cfg(test)]
mod tests {
    use cyclorb_theory::parse_spec;

    use super::BlockSpace;

    #[test]
    fn pointed_theories_have_n_to_the_g_blocks() {
        // Verlinde's formula dim V_g = Σ_a (D/d_a)^{2g−2} (Verlinde 1988) with every d_a = 1
        // and D² = N gives N^g for the pointed Z_N theories
        for (spec, n) in [("zn:2:1", 2usize), ("zn:3:2", 3), ("zn:4:1", 4)] {
            for genus in 1..=3u32 {
                let space = BlockSpace::new(parse_spec(spec).unwrap(), genus as usize).unwrap();
                assert_eq!(space.dimension(), n.pow(genus), "{spec} genus {genus}");
            }
        }
    }
}
