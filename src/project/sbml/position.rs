//! Byte offsets → 1-based line and column, computed only when a problem is
//! reported (parsing keeps offsets; most files have no problem at all).

/// Line starts of a text, for turning byte offsets into line:column.
pub(crate) struct LineIndex<'a> {
    bytes: &'a [u8],
    starts: Vec<usize>,
}

impl<'a> LineIndex<'a> {
    pub(crate) fn new(bytes: &'a [u8]) -> LineIndex<'a> {
        let mut starts = vec![0];
        starts.extend(
            bytes
                .iter()
                .enumerate()
                .filter(|(_, b)| **b == b'\n')
                .map(|(i, _)| i + 1),
        );
        LineIndex { bytes, starts }
    }

    /// 1-based line of a byte offset (no column: cheap on one-line files).
    pub(crate) fn line(&self, offset: usize) -> usize {
        self.starts
            .partition_point(|&s| s <= offset.min(self.bytes.len()))
    }

    /// 1-based (line, column) of a byte offset; the column counts
    /// characters, not bytes, so it matches what an editor shows.
    pub(crate) fn locate(&self, offset: usize) -> (usize, usize) {
        let offset = offset.min(self.bytes.len());
        let line = self.starts.partition_point(|&s| s <= offset) - 1;
        let column = self.bytes[self.starts[line]..offset]
            .iter()
            .filter(|b| (**b & 0xC0) != 0x80) // count UTF-8 lead bytes only
            .count();
        (line + 1, column + 1)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lines_and_columns() {
        let text = "ab\ncdé\n\nx";
        let index = LineIndex::new(text.as_bytes());
        assert_eq!(index.locate(0), (1, 1));
        assert_eq!(index.locate(1), (1, 2));
        assert_eq!(index.locate(3), (2, 1));
        // `é` takes two bytes but one column: the newline after it is column 4.
        assert_eq!(index.locate(7), (2, 4));
        assert_eq!(index.locate(8), (3, 1));
        assert_eq!(index.locate(9), (4, 1));
        assert_eq!(index.locate(999), (4, 2));
        assert_eq!(index.line(7), 2);
        assert_eq!(index.line(9), 4);
    }
}
