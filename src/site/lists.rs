//! Long lists split into pages: `reactions/index.html`, `index.2.html`, …
//! with at most [`ROWS_PER_PAGE`] rows each, so a genome-scale model's list
//! stays a page a browser opens at once (Recon3D: 10,600 reactions).

use serde::Serialize;

/// Rows on one page of a list.
pub const ROWS_PER_PAGE: usize = 500;

/// Rows on one page of the loop list (`loops/index.html`, …): a row names
/// every member, about 0.8 kB on Recon3D, and the first page also holds
/// the loop-capable reactions and the energy-generating cycles.
pub const LOOP_ROWS_PER_PAGE: usize = 200;

/// One page of a list, as the template sees it (`pager`).
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct ListPage {
    /// Path in the site, e.g. `reactions/index.2.html`.
    pub path: String,
    /// 1-based page number and page count.
    pub number: usize,
    pub pages: usize,
    /// Rows `start..end` of the sorted list (0-based, end exclusive).
    pub start: usize,
    pub end: usize,
    pub total: usize,
    /// Every page of the list: (number, file name in the same folder,
    /// first row, last row, 1-based), for the page links.
    pub links: Vec<PageLink>,
}

#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct PageLink {
    pub number: usize,
    pub file: String,
    pub first: usize,
    pub last: usize,
}

/// Bytes of loop rows (and, on the first page, of the other sections) a
/// page of the loop list holds, about.
pub const LOOP_PAGE_BUDGET: usize = 350_000;

/// The pages of the loop list (`loops/index.html`, `index.2.html`, …): at
/// most [`LOOP_ROWS_PER_PAGE`] rows and about [`LOOP_PAGE_BUDGET`] bytes,
/// estimated from the ids each row and the first page's sections name.
pub fn loop_list(report: &crate::report::Report) -> Vec<ListPage> {
    let Some(lv) = &report.loops else {
        return pages_of("loops", 0, LOOP_ROWS_PER_PAGE);
    };
    let link = |id: &str| 2 * id.len() + 50;
    let sizes = lv.loops.iter().map(|l| {
        let members: usize = l.members.iter().map(|m| link(&m.reaction) + 30).sum();
        let constraint = l.constrain.as_ref().map_or(0, |c| link(&c.reaction) + 80);
        600 + members + constraint
    });
    let first = 10_000
        + lv.capable.iter().map(|c| link(&c.reaction)).sum::<usize>()
        + lv.uncovered.iter().map(|id| link(id)).sum::<usize>()
        + 250 * lv.relaxed_bounds.len()
        + lv.energy_cycles
            .iter()
            .map(|c| 600 + 2 * c.equation.len())
            .sum::<usize>();
    let ranges = split_by_size(sizes, LOOP_ROWS_PER_PAGE, LOOP_PAGE_BUDGET, first);
    pages_at("loops", &ranges, lv.loops.len())
}

/// File name of page `number` (1-based) of a list in its folder.
fn file_name(number: usize) -> String {
    if number == 1 {
        "index.html".into()
    } else {
        format!("index.{number}.html")
    }
}

/// The pages of a list of `total` rows kept in folder `dir`; an empty list
/// still has its one (empty) page.
pub fn pages(dir: &str, total: usize) -> Vec<ListPage> {
    pages_of(dir, total, ROWS_PER_PAGE)
}

/// [`pages`] with `per_page` rows a page (lists with long rows).
pub fn pages_of(dir: &str, total: usize, per_page: usize) -> Vec<ListPage> {
    let per_page = per_page.max(1);
    let ranges: Vec<(usize, usize)> = (0..total.div_ceil(per_page))
        .map(|p| (p * per_page, ((p + 1) * per_page).min(total)))
        .collect();
    pages_at(dir, &ranges, total)
}

/// Row ranges of pages holding at most `max_rows` rows and, where rows are
/// long, about `budget` bytes: `sizes` estimates each row's bytes, `first`
/// what the first page holds besides its rows. A page always takes at
/// least one row.
pub fn split_by_size(
    sizes: impl IntoIterator<Item = usize>,
    max_rows: usize,
    budget: usize,
    first: usize,
) -> Vec<(usize, usize)> {
    let mut ranges = Vec::new();
    let (mut start, mut rows, mut bytes) = (0, 0, first);
    let mut total = 0;
    for (k, size) in sizes.into_iter().enumerate() {
        total = k + 1;
        let full = rows >= max_rows.max(1) || bytes + size > budget;
        if full && rows > 0 {
            ranges.push((start, k));
            (start, rows, bytes) = (k, 0, 0);
        }
        rows += 1;
        bytes += size;
    }
    if total > start || ranges.is_empty() {
        ranges.push((start, total));
    }
    ranges
}

/// The pages holding the rows `ranges` (consecutive, from 0 to `total`).
pub fn pages_at(dir: &str, ranges: &[(usize, usize)], total: usize) -> Vec<ListPage> {
    let count = ranges.len().max(1);
    let range = |n: usize| ranges.get(n - 1).copied().unwrap_or((0, 0));
    let links: Vec<PageLink> = (1..=count)
        .map(|n| PageLink {
            number: n,
            file: file_name(n),
            first: (range(n).0 + 1).min(total),
            last: range(n).1,
        })
        .collect();
    (1..=count)
        .map(|n| ListPage {
            path: format!("{dir}/{}", file_name(n)),
            number: n,
            pages: count,
            start: range(n).0,
            end: range(n).1,
            total,
            links: links.clone(),
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn long_rows_make_shorter_pages() {
        // Rows of 100 bytes, 1,000 a page at most, 450 bytes a page.
        assert_eq!(
            split_by_size([100; 10], 1000, 450, 0),
            [(0, 4), (4, 8), (8, 10)]
        );
        // At most 3 rows a page whatever their size.
        assert_eq!(split_by_size([1; 7], 3, 450, 0), [(0, 3), (3, 6), (6, 7)]);
        // The first page already holds 300 bytes of other content.
        assert_eq!(split_by_size([100; 5], 1000, 450, 300), [(0, 1), (1, 5)]);
        // ... or more than its budget: it still takes one row.
        assert_eq!(split_by_size([100; 2], 1000, 450, 500), [(0, 1), (1, 2)]);
        // A row longer than a page still gets one; no rows, one empty page.
        assert_eq!(split_by_size([900, 10], 1000, 450, 0), [(0, 1), (1, 2)]);
        assert_eq!(split_by_size([], 10, 450, 0), [(0, 0)]);
        let p = pages_at("loops", &[(0, 1), (1, 3)], 3);
        assert_eq!((p[1].start, p[1].end, p[1].pages), (1, 3, 2));
        assert_eq!((p[0].links[1].first, p[0].links[1].last), (2, 3));
    }

    #[test]
    fn rows_are_split_into_pages_of_at_most_500() {
        let p = pages("reactions", 1001);
        assert_eq!(p.len(), 3);
        assert_eq!(
            p.iter().map(|x| x.path.as_str()).collect::<Vec<_>>(),
            [
                "reactions/index.html",
                "reactions/index.2.html",
                "reactions/index.3.html"
            ]
        );
        assert_eq!((p[1].start, p[1].end), (500, 1000));
        assert_eq!((p[2].start, p[2].end), (1000, 1001));
        assert_eq!((p[2].links[2].first, p[2].links[2].last), (1001, 1001));
        assert_eq!(pages("m", 500).len(), 1);
        let empty = pages("m", 0);
        assert_eq!((empty.len(), empty[0].start, empty[0].end), (1, 0, 0));
    }
}
