use cyclorb_mcg::*;
use cyclorb_theory::parse_spec;

#[test]
fn quick() {
    for (spec, g) in [
        ("ising", 1usize),
        ("ising", 2),
        ("fibonacci", 1),
        ("fibonacci", 2),
        ("su2:4", 2),
        ("ising", 3),
    ] {
        let t = parse_spec(spec).unwrap();
        let space = BlockSpace::new(t, g).unwrap();
        let checks = check_relations(&space).unwrap();
        let bad: Vec<_> = checks
            .iter()
            .filter(|c| !c.ok)
            .map(|c| c.name.clone())
            .collect();
        println!("{spec} g={g} dim={} failures={bad:?}", space.dimension());
    }
}
