//! Deterministic data parallelism: a range of indices cut into contiguous pieces, one
//! scoped thread per piece, the pieces' answers joined in index order. The result never
//! depends on the number of threads.

use std::ops::Range;

use crate::error::CertError;

/// `0..n` cut into at most `pieces` contiguous ranges of nearly equal length, in order.
pub(crate) fn split(n: usize, pieces: usize) -> Vec<Range<usize>> {
    let pieces = pieces.clamp(1, n.max(1));
    (0..pieces)
        .map(|k| n * k / pieces..n * (k + 1) / pieces)
        .collect()
}

/// `work` on every piece of `0..n` (one thread per piece when `threads` > 1), the answers
/// concatenated in index order; the first error (in index order) wins.
pub(crate) fn map_ranges<T, F>(n: usize, threads: usize, work: F) -> Result<Vec<T>, CertError>
where
    T: Send,
    F: Fn(Range<usize>) -> Result<Vec<T>, CertError> + Sync,
{
    let ranges = split(n, threads);
    let answers: Vec<Result<Vec<T>, CertError>> = if ranges.len() == 1 {
        vec![work(0..n)]
    } else {
        std::thread::scope(|scope| {
            let handles: Vec<_> = ranges
                .into_iter()
                .map(|r| {
                    let work = &work;
                    scope.spawn(move || work(r))
                })
                .collect();
            handles
                .into_iter()
                .map(|h| {
                    h.join().unwrap_or_else(|_| {
                        Err(CertError::Input("a worker thread panicked".into()))
                    })
                })
                .collect()
        })
    };
    let mut out = Vec::with_capacity(n);
    for answer in answers {
        out.extend(answer?);
    }
    Ok(out)
}

/// The first index of `range` (in order) for which `test` gives `Some`, with its answer;
/// the range is cut into one piece per thread and each piece searched from its start, with
/// working space made by `scratch` once per piece.
pub(crate) fn first_match<S, T, I, F>(
    range: Range<usize>,
    threads: usize,
    scratch: I,
    test: F,
) -> Result<Option<(usize, T)>, CertError>
where
    T: Send,
    I: Fn() -> S + Sync,
    F: Fn(&mut S, usize) -> Option<T> + Sync,
{
    let search = |r: Range<usize>| {
        let mut space = scratch();
        r.into_iter()
            .find_map(|i| test(&mut space, i).map(|t| (i, t)))
    };
    let pieces = split(range.len(), threads);
    if pieces.len() == 1 {
        return Ok(search(range));
    }
    let start = range.start;
    std::thread::scope(|scope| {
        let handles: Vec<_> = pieces
            .into_iter()
            .map(|r| {
                let search = &search;
                scope.spawn(move || search(start + r.start..start + r.end))
            })
            .collect();
        // joined in order: the first piece with a match holds the first match
        let mut found = None;
        for h in handles {
            let answer = h
                .join()
                .map_err(|_| CertError::Input("a worker thread panicked".into()))?;
            if found.is_none() {
                found = answer;
            }
        }
        Ok(found)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn pieces_cover_the_range_in_order() {
        for (n, t) in [(0, 3), (1, 4), (10, 3), (7, 7), (5, 1)] {
            let pieces = split(n, t);
            let joined: Vec<usize> = pieces.into_iter().flatten().collect();
            assert_eq!(joined, (0..n).collect::<Vec<_>>());
        }
    }

    #[test]
    fn answers_do_not_depend_on_the_thread_count() {
        let squares = |t| map_ranges(1000, t, |r| Ok(r.map(|i| i * i).collect())).unwrap();
        assert_eq!(squares(1), squares(3));
        let first =
            |t| first_match(10..1000, t, || (), |_, i| (i % 97 == 0).then_some(i / 97)).unwrap();
        assert_eq!(first(1), Some((97, 1)));
        assert_eq!(first(4), Some((97, 1)));
        assert_eq!(
            first_match(0..50, 2, || (), |_, _| None::<()>).unwrap(),
            None
        );
    }
}
