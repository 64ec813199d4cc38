//! Standard input as numbered lines (from 1), each valid UTF-8 or reported as not.

use std::io::{self, BufRead};

/// Calls `each(n, line)` for every line of standard input (`line` without its `\n`), or
/// `each(n, Err(..))` for a line that is not UTF-8. Stops at the first read error or the first
/// error `each` returns.
pub fn for_each_line<E: From<io::Error>>(
    mut each: impl FnMut(usize, Result<&str, &'static str>) -> Result<(), E>,
) -> Result<(), E> {
    for (i, bytes) in io::stdin().lock().split(b'\n').enumerate() {
        let bytes = bytes?;
        let line = std::str::from_utf8(&bytes).map_err(|_| "not valid UTF-8");
        each(i + 1, line)?;
    }
    Ok(())
}
