"""Re-checking certificates from Python (`cyclorb.check`), as `cyclorb check` does."""

import copy
import json

import pytest

import cyclorb


def test_an_image_certificate_of_the_library_rechecks_from_dict_text_and_file(tmp_path):
    # Schreier–Sims on the 24 lines of the Ising vacuum orbit at genus 1 (Castro, Gaberdiel,
    # Hartman, Maloney, Volpato 2012: 24 terms); each line's stabiliser has the same order,
    # so 24 divides the image order
    r = cyclorb.image("ising", 1, route="orbit")
    assert r.certificate_kind == "image-orbit" and r.order % 24 == 0
    checked = cyclorb.check(r.certificate_file)
    assert checked.ok and bool(checked) and checked.failed is None
    assert (checked.kind, checked.spec, checked.genus) == ("image-orbit", "ising", 1)
    assert checked.generating_set == "humphries"
    assert checked.claims[0].name == "input" and all(c.ok for c in checked.claims)
    # the same file as JSON text and on disk (str and pathlib paths)
    text = json.dumps(r.certificate_file)
    assert cyclorb.check(text).raw == checked.raw
    path = tmp_path / "image.json"
    path.write_text(text)
    on_disk = cyclorb.check(path)
    assert on_disk.ok and on_disk.file == str(path)
    assert [c.name for c in on_disk.claims] == [c.name for c in checked.claims]
    assert cyclorb.check(str(path)).ok


def test_a_witness_certificate_rechecks():
    # Fibonacci at genus 2 has an infinite image (Freedman, Larsen and Wang 2002)
    w = cyclorb.witness("fibonacci", 2)
    assert w.found
    checked = cyclorb.check(w.certificate_file)
    assert checked.ok and checked.kind == "witness"


def test_a_tampered_commutant_certificate_fails_its_claim():
    # Z_3 at genus 1: charge conjugation a ↦ −a commutes with S and T (S² = C, common
    # practice), so the commutant is 2-dimensional; claiming 1 fails the lower bound
    c = cyclorb.commutant("zn:3:2", 1)
    assert c.dimension == 2
    assert cyclorb.check(c.certificate_file).ok
    tampered = copy.deepcopy(c.certificate_file)
    tampered["dimension"] = 1
    checked = cyclorb.check(tampered)
    assert not checked.ok and not bool(checked)
    assert checked.failed == "lower-bound"
    assert checked.claims[-1].name == "lower-bound" and not checked.claims[-1].ok
    assert all(claim.ok for claim in checked.claims[:-1])


def test_a_malformed_certificate_raises_the_programs_message(tmp_path):
    with pytest.raises(cyclorb.CyclorbError) as e:
        cyclorb.check({"kind": "commutant"})
    assert str(e.value).startswith("<certificate>: key `genus`: missing")
    c = cyclorb.commutant("zn:3:2", 1).certificate_file
    c["kind"] = "nothing"
    with pytest.raises(cyclorb.CyclorbError, match="c.json: key `kind`: unknown kind"):
        cyclorb.check(c, name="c.json")
    with pytest.raises(cyclorb.CyclorbError, match="expected a JSON object"):
        cyclorb.check("[1, 2]")
    repeated = tmp_path / "repeated.json"
    repeated.write_text('{"kind": "a", "kind": "b"}')
    with pytest.raises(cyclorb.CyclorbError, match="repeated.json: not JSON"):
        cyclorb.check(repeated)
    missing = tmp_path / "missing.json"
    with pytest.raises(cyclorb.CyclorbError, match="missing.json"):
        cyclorb.check(missing)
    with pytest.raises(TypeError):
        cyclorb.check(42)
