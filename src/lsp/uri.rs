//! File URIs (`file:///home/…`, RFC 8089) as paths and back, with the percent-encoding of
//! RFC 3986 section 2.1. Other schemes name no file gonogo can read.

use std::path::{Path, PathBuf};

use lsp_types::Uri;

/// The path a `file:` URI names, or `None` for another scheme.
pub fn to_path(uri: &Uri) -> Option<PathBuf> {
    let rest = uri.as_str().strip_prefix("file://")?;
    // an authority of `localhost` or nothing names this machine (RFC 8089, section 2)
    let path = rest.strip_prefix("localhost").unwrap_or(rest);
    let bytes = decode(path.split(['?', '#']).next().unwrap_or_default())?;
    Some(PathBuf::from(String::from_utf8(bytes).ok()?))
}

/// The `file:` URI of an absolute path.
pub fn from_path(path: &Path) -> Option<Uri> {
    let absolute = if path.is_absolute() {
        path.to_path_buf()
    } else {
        std::env::current_dir().ok()?.join(path)
    };
    let mut text = String::from("file://");
    for byte in absolute.to_str()?.bytes() {
        if byte.is_ascii_alphanumeric() || b"/-._~".contains(&byte) {
            text.push(char::from(byte));
        } else {
            text.push_str(&format!("%{byte:02X}"));
        }
    }
    text.parse().ok()
}

fn decode(text: &str) -> Option<Vec<u8>> {
    let bytes = text.as_bytes();
    let mut out = Vec::with_capacity(bytes.len());
    let mut i = 0;
    while i < bytes.len() {
        if bytes[i] == b'%' {
            let hex = std::str::from_utf8(bytes.get(i + 1..i + 3)?).ok()?;
            out.push(u8::from_str_radix(hex, 16).ok()?);
            i += 3;
        } else {
            out.push(bytes[i]);
            i += 1;
        }
    }
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// RFC 8089 appendix B: `file:///path/to/file` and `file://localhost/path/to/file` name
    /// the same local file; RFC 3986 2.1: a space is `%20`.
    #[test]
    fn file_uris_round_trip_through_paths() {
        let uri: Uri = "file:///tmp/a%20b/t%C3%A9.rules"
            .parse()
            .unwrap_or_else(|_| panic!());
        assert_eq!(to_path(&uri), Some(PathBuf::from("/tmp/a b/té.rules")));
        let local: Uri = "file://localhost/tmp/x.rules"
            .parse()
            .unwrap_or_else(|_| panic!());
        assert_eq!(to_path(&local), Some(PathBuf::from("/tmp/x.rules")));
        let back = from_path(Path::new("/tmp/a b/té.rules")).unwrap_or_else(|| panic!());
        assert_eq!(back.as_str(), "file:///tmp/a%20b/t%C3%A9.rules");
        let other: Uri = "untitled:1".parse().unwrap_or_else(|_| panic!());
        assert_eq!(to_path(&other), None);
    }
}
