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
    let count = total.div_ceil(per_page).max(1);
    let links: Vec<PageLink> = (1..=count)
        .map(|n| PageLink {
            number: n,
            file: file_name(n),
            first: ((n - 1) * per_page + 1).min(total),
            last: (n * per_page).min(total),
        })
        .collect();
    (1..=count)
        .map(|n| ListPage {
            path: format!("{dir}/{}", file_name(n)),
            number: n,
            pages: count,
            start: (n - 1) * per_page,
            end: (n * per_page).min(total),
            total,
            links: links.clone(),
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

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
