//! Length-framed parts in a spool: what a run writes to a temporary file to read back later
//! in order (the text field table's rows, a season run's staged inspections). Each part is its
//! length in bytes (8, little-endian) and the bytes.

use std::io::{self, Read, Write};

/// Writes one part.
pub fn write_part(spool: &mut impl Write, bytes: &[u8]) -> io::Result<()> {
    spool.write_all(&(bytes.len() as u64).to_le_bytes())?;
    spool.write_all(bytes)
}

/// Reads back the next part [`write_part`] wrote.
pub fn read_part(spool: &mut impl Read) -> io::Result<Vec<u8>> {
    let mut length = [0u8; 8];
    spool.read_exact(&mut length)?;
    let length = usize::try_from(u64::from_le_bytes(length))
        .map_err(|e| io::Error::new(io::ErrorKind::InvalidData, e))?;
    let mut bytes = vec![0u8; length];
    spool.read_exact(&mut bytes)?;
    Ok(bytes)
}

/// Reads back a part that was text.
pub fn read_text(spool: &mut impl Read) -> io::Result<String> {
    String::from_utf8(read_part(spool)?).map_err(|e| io::Error::new(io::ErrorKind::InvalidData, e))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parts_read_back_as_written_empty_ones_too() {
        let mut spool = Vec::new();
        for part in ["TV-1", "", "½ €"] {
            write_part(&mut spool, part.as_bytes()).unwrap_or_default();
        }
        let mut reader = spool.as_slice();
        let back: Vec<String> = (0..3).filter_map(|_| read_text(&mut reader).ok()).collect();
        assert_eq!(back, ["TV-1", "", "½ €"]);
        assert!(
            read_part(&mut reader).is_err(),
            "nothing past the last part"
        );
    }
}
