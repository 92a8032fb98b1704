//! Re-checking a certificate of the imprimitive route, one claim at a time.
//!
//! Exact steps: the generators and the twist powers are rebuilt from the theory; the stated
//! components sum to the vacuum vector; the line representatives are rebuilt from the
//! components along the stated tree and every generator maps every representative to the
//! stated root of unity times the stated representative (so M acts monomially on the
//! lines); the lines span V modulo a prime; every line is a joint eigenvector with its
//! sector's signature, the sector dimensions add up to dim V and the generators permute the
//! sectors. From this verified data the block permutation group is ordered by cyclorb-cert's
//! Schreier–Sims (every point a base point), and the chain, the set stabiliser, the
//! patterns and the sector commutants are derived again and compared field by field (the
//! producer's own steps).

use cyclorb_cert::permutation_group_summary;
use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_mcg::BlockSpace;

use crate::analyse::kernel_certificate;
use crate::error::{require, StructureError};
use crate::imprimitive::{count, lickorish_candidate, sector_supports, ImprimitiveCertificate};
use crate::lineorbit::{replay, spans, LineOrbit};
use crate::power::PowerCandidate;
use crate::search::{generators_named, Generators};
use crate::sectors::{sectors, Sectors};
use crate::sectorsum::sector_orbits;
use crate::sparse::SparseVec;
use cyclorb_field::RootsOfUnity;

/// A sparse vector from its text form (increasing in-range indices, non-zero values).
pub(crate) fn sparse_parse(
    field: &CyclotomicField,
    entries: &[(u32, String)],
    dim: usize,
) -> Result<SparseVec, StructureError> {
    let mut out: Vec<(u32, Cyc)> = Vec::with_capacity(entries.len());
    for (i, text) in entries {
        let x = field.parse(text)?;
        let increasing = out.last().map_or(true, |(j, _)| j < i);
        if (*i as usize) >= dim || !increasing || x.is_zero() {
            return Err(StructureError::Input(
                "a sparse vector needs increasing in-range indices and non-zero values".into(),
            ));
        }
        out.push((*i, x));
    }
    Ok(SparseVec(out))
}

/// The state of a re-check: each claim adds what the next ones use.
pub struct ImprimitiveCheck<'a> {
    space: &'a BlockSpace,
    certificate: &'a ImprimitiveCertificate,
    roots: RootsOfUnity,
    generators: Generators,
    candidate: PowerCandidate,
    components: Vec<SparseVec>,
    lines: Option<LineOrbit>,
    sectors: Option<Sectors>,
}

impl<'a> ImprimitiveCheck<'a> {
    /// Claim `identity`: the certificate names this theory, genus, field, generators and a
    /// candidate power.
    pub fn new(
        space: &'a BlockSpace,
        certificate: &'a ImprimitiveCertificate,
    ) -> Result<(ImprimitiveCheck<'a>, String), StructureError> {
        let theory = space.theory();
        let field = theory.field();
        let roots = RootsOfUnity::new(field)?;
        let generators = generators_named(space, &certificate.generating_set)?;
        require(
            certificate.theory == theory.name()
                && certificate.genus == space.genus()
                && certificate.conductor == field.conductor()
                && certificate.phase_modulus == roots.modulus()
                && certificate.generators == generators.names,
            || "the certificate is for another theory, genus, field or generator set".into(),
        )?;
        let candidate = lickorish_candidate(space, certificate.power)?.map_err(|reason| {
            StructureError::Rejected(format!("the stated power is not a candidate: {reason}"))
        })?;
        let detail = format!(
            "{} at genus {}, {} generators, phases in Z/{}; the {}-th powers of the {} Lickorish twists commute exactly and are annihilated by Π(x − θ^k)",
            theory.name(),
            space.genus(),
            generators.names.len(),
            roots.modulus(),
            certificate.power,
            candidate.operators.len()
        );
        Ok((
            ImprimitiveCheck {
                space,
                certificate,
                roots,
                generators,
                candidate,
                components: Vec::new(),
                lines: None,
                sectors: None,
            },
            detail,
        ))
    }

    fn field(&self) -> &CyclotomicField {
        self.space.theory().field()
    }

    /// Claim `vacuum-components`: the stated components sum to the vacuum vector.
    pub fn components(&mut self) -> Result<String, StructureError> {
        let field = self.field();
        let dim = self.space.dimension();
        let parts = self
            .certificate
            .components
            .iter()
            .map(|e| sparse_parse(field, e, dim))
            .collect::<Result<Vec<_>, _>>()?;
        let support = self.certificate.vacuum_components;
        require(support >= 1 && support <= parts.len(), || {
            "the number of vacuum components is out of range".into()
        })?;
        let mut sum = SparseVec::default();
        for v in &parts[..support] {
            sum = sum.sub_scaled(field, &field.int(-1), v)?;
        }
        require(
            sum == SparseVec::unit(field, self.space.basis().vacuum()),
            || "the components do not sum to the vacuum vector".into(),
        )?;
        let detail = format!(
            "the first {support} of {} starting lines sum to the vacuum vector exactly",
            parts.len()
        );
        self.components = parts;
        Ok(detail)
    }

    /// Claim `line-monomials`: the representatives rebuilt along the tree, every generator
    /// monomial on them, exactly.
    pub fn lines(&mut self) -> Result<String, StructureError> {
        let starts = std::mem::take(&mut self.components);
        let lines = replay(
            self.space.theory().field(),
            &self.roots,
            &self.generators.maps,
            starts,
            self.certificate.vacuum_components,
            &self.certificate.tree,
            &self.certificate.monomials,
        )?;
        let detail = format!(
            "{} line representatives rebuilt from the components along the tree; each of the {} generators maps each to the stated root of unity times the stated representative, exactly",
            lines.vectors.len(),
            self.generators.maps.len()
        );
        self.lines = Some(lines);
        Ok(detail)
    }

    fn line_orbit(&self) -> Result<&LineOrbit, StructureError> {
        self.lines
            .as_ref()
            .ok_or_else(|| StructureError::Rejected("the lines are not checked yet".into()))
    }

    /// Claim `spanning`: the representatives have rank dim V modulo a prime.
    pub fn spanning(&self) -> Result<String, StructureError> {
        let lines = self.line_orbit()?;
        let dim = self.space.dimension();
        require(spans(self.field(), &lines.vectors, dim)?, || {
            "the line representatives are not proved to span the space".into()
        })?;
        Ok(format!(
            "rank {dim} modulo a prime p ≡ 1 (mod n): the lines span V, so the monomial action is faithful"
        ))
    }

    /// Claim `sectors`: every line a joint eigenvector of its sector's signature, the
    /// sector dimensions adding up to dim V, the generators permuting the sectors.
    pub fn sectors(&mut self) -> Result<String, StructureError> {
        let lines = self.line_orbit()?;
        let found = sectors(self.field(), &self.candidate, lines, self.space.dimension())?;
        let c = self.certificate;
        require(
            found.class_of == c.sector_of_line
                && found.signatures == c.sector_signatures
                && found.dimensions == c.sector_dimensions,
            || "the sectors differ from the stated ones".into(),
        )?;
        let detail = format!(
            "{} lines, each a joint eigenvector of the {}-th powers; {} sectors of dimensions adding up to {}; every generator maps sectors onto sectors",
            lines.vectors.len(),
            c.power,
            found.count(),
            self.space.dimension()
        );
        self.sectors = Some(found);
        Ok(detail)
    }

    fn sector_data(&self) -> Result<&Sectors, StructureError> {
        self.sectors
            .as_ref()
            .ok_or_else(|| StructureError::Rejected("the sectors are not checked yet".into()))
    }

    /// Claim `block-permutations`: the order of the group the generators induce on the
    /// sectors, by cyclorb-cert's Schreier–Sims with every point a base point.
    pub fn block_permutations(&self) -> Result<String, StructureError> {
        let sectors = self.sector_data()?;
        let summary = permutation_group_summary(sectors.count(), &sectors.permutations)?;
        Ok(format!(
            "the block permutation group on {} sectors has order {} (cyclorb-cert's Schreier–Sims, every point a base point); the vacuum's set of sectors has {} images",
            sectors.count(),
            summary.order,
            sector_supports(sectors, self.certificate.vacuum_components)
        ))
    }

    /// Claim `derived-data`: the chain, kernel, set stabiliser, patterns, counts and sector
    /// commutants derived again by the producer's steps and compared.
    pub fn derived(
        &self,
        stabiliser_limit: usize,
        primes: usize,
    ) -> Result<String, StructureError> {
        let lines = self.line_orbit()?;
        let sectors = self.sector_data()?;
        let c = self.certificate;
        let m = self.roots.modulus();
        let counted = count(m, lines, sectors, stabiliser_limit)?;
        require(
            counted.chain.base() == c.base
                && counted.chain.basic_orbit_lengths() == c.basic_orbit_lengths
                && kernel_certificate(counted.chain.kernel()) == c.kernel
                && counted.support_permutations == c.support_permutations,
            || "the chain, kernel or support stabiliser data differ".into(),
        )?;
        require(
            counted.image_order.to_string() == c.image_order
                && counted.supports.to_string() == c.supports
                && counted.patterns.to_string() == c.patterns_per_support
                && counted.orbit_size.to_string() == c.orbit_size,
            || "the image order or the orbit count differ".into(),
        )?;
        let orbits = sector_orbits(
            self.space,
            &self.roots,
            lines,
            sectors,
            &counted.orbit_size,
            primes,
        )?;
        require(orbits == c.sector_orbits, || {
            "the sector commutants or the terms of B differ".into()
        })?;
        Ok(format!(
            "|image| = {}, |orbit| = {} = {} supports × {} patterns, {} sector orbits: re-derived by the producer's own steps (not an independent check)",
            c.image_order,
            c.orbit_size,
            c.supports,
            c.patterns_per_support,
            orbits.len()
        ))
    }
}

/// Re-check a certificate of the imprimitive route against the block space: every claim,
/// or (`derived` false) the exact claims only, leaving the re-derivation of the chain, the
/// counts and the commutants (the producer's own steps, as long as the analysis) to
/// `cyclorb check`.
pub fn recheck_imprimitive(
    space: &BlockSpace,
    certificate: &ImprimitiveCertificate,
    derived: Option<usize>,
) -> Result<(), StructureError> {
    let (mut check, _) = ImprimitiveCheck::new(space, certificate)?;
    check.components()?;
    check.lines()?;
    check.spanning()?;
    check.sectors()?;
    check.block_permutations()?;
    if let Some(stabiliser_limit) = derived {
        check.derived(stabiliser_limit, 2)?;
    }
    Ok(())
}
