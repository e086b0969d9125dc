//! Source files and byte spans: reading a rulebook or a declaration from disk or from
//! standard input (`-`) with its size and encoding checked, the log of every file read (so
//! that a write never replaces one, see [`crate::output`]), and the one place where parser
//! offsets become miette spans.

use std::io::Read;
use std::path::{Path, PathBuf};
use std::sync::{Arc, Mutex, OnceLock};

use miette::{NamedSource, SourceSpan};

/// Largest source file gonogo reads, in bytes (8 MiB).
pub const MAX_FILE_BYTES: u64 = 8 * 1024 * 1024;

/// Index of a file in a [`SourceMap`].
pub type FileId = u32;

/// A byte range in one source file. Two spans are equal when they cover the same bytes of the
/// same file; the syntax tree leaves its spans out of its own equality (see
/// [`crate::parse::ast`]).
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Hash)]
pub struct Span {
    /// The file the span lies in.
    pub file: FileId,
    /// First byte.
    pub start: usize,
    /// One past the last byte.
    pub end: usize,
}

impl Span {
    /// A span from `start` to `end` in `file`.
    pub fn new(file: FileId, start: usize, end: usize) -> Span {
        Span { file, start, end }
    }

    /// The smallest span covering both.
    pub fn to(self, other: Span) -> Span {
        Span::new(
            self.file,
            self.start.min(other.start),
            self.end.max(other.end),
        )
    }

    /// The span as miette wants it.
    pub fn source_span(self) -> SourceSpan {
        SourceSpan::new(self.start.into(), self.end.saturating_sub(self.start))
    }
}

/// One loaded source file.
#[derive(Debug)]
pub struct SourceFile {
    /// The path as the user gave it (or as an include resolved it).
    pub path: PathBuf,
    /// The text, valid UTF-8.
    pub text: Arc<str>,
    /// Where each line starts, found once when a diagnostic first needs it.
    line_starts: std::sync::OnceLock<Vec<usize>>,
}

impl SourceFile {
    /// The file as a miette source, named by its path.
    pub fn named_source(&self) -> NamedSource<Arc<str>> {
        NamedSource::new(self.path.display().to_string(), self.text.clone())
    }

    /// A file of this text under this path.
    pub fn new(path: PathBuf, text: Arc<str>) -> SourceFile {
        SourceFile {
            path,
            text,
            line_starts: std::sync::OnceLock::new(),
        }
    }

    /// One-based line and column of a byte offset.
    pub fn line_column(&self, offset: usize) -> (usize, usize) {
        let at = floor_char_boundary(&self.text, offset);
        let line = self.line_of(at);
        let start = self.line_start(line);
        let column = self.text[start..at].chars().count() + 1;
        (line + 1, column)
    }

    /// The zero-based line a byte offset is on. The line index is built once per file, so a
    /// rulebook with thousands of diagnostics is not scanned from its start for each one.
    pub fn line_of(&self, offset: usize) -> usize {
        let starts = self.line_starts();
        starts.partition_point(|&s| s <= offset).saturating_sub(1)
    }

    /// Where the zero-based line `line` starts (the end of the text past the last line).
    pub fn line_start(&self, line: usize) -> usize {
        self.line_starts()
            .get(line)
            .copied()
            .unwrap_or(self.text.len())
    }

    fn line_starts(&self) -> &[usize] {
        self.line_starts.get_or_init(|| {
            std::iter::once(0)
                .chain(self.text.match_indices('\n').map(|(i, _)| i + 1))
                .collect()
        })
    }
}

/// The largest character boundary of `text` at or before `offset`.
pub(crate) fn floor_char_boundary(text: &str, offset: usize) -> usize {
    let mut at = offset.min(text.len());
    while !text.is_char_boundary(at) {
        at -= 1;
    }
    at
}

/// The canonical form of `path`, or `path` itself when it cannot be had (a file not yet
/// saved).
pub fn canonical_or_same(path: &Path) -> PathBuf {
    path.canonicalize().unwrap_or_else(|_| path.to_path_buf())
}

/// Why a file could not be read as source text.
#[derive(Debug)]
pub enum ReadFailure {
    /// The operating system refused (missing file, permissions).
    Io(std::io::Error),
    /// Longer than [`MAX_FILE_BYTES`]: more bytes than that could be read from it.
    TooLarge,
    /// Not UTF-8: where the first bad byte is.
    NotUtf8(BadByte),
}

/// The first byte of a file that is not UTF-8, placed as a person finds it in an editor.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct BadByte {
    /// Its value.
    pub value: u8,
    /// Its line, from 1.
    pub line: usize,
    /// Its column, from 1, counted in characters of the valid text before it.
    pub column: usize,
}

impl BadByte {
    /// The first bad byte of `bytes`, which are valid UTF-8 up to `valid_up_to`.
    pub fn find(bytes: &[u8], valid_up_to: usize) -> BadByte {
        let valid = bytes.get(..valid_up_to).unwrap_or_default();
        let text = std::str::from_utf8(valid).unwrap_or_default();
        let line = text.matches('\n').count() + 1;
        let column = text.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
        BadByte {
            value: bytes.get(valid_up_to).copied().unwrap_or_default(),
            line,
            column,
        }
    }
}

/// Every byte of `reader`, or [`ReadFailure::TooLarge`] once more than [`MAX_FILE_BYTES`]
/// bytes have come.
pub fn read_capped(reader: impl Read) -> Result<Vec<u8>, ReadFailure> {
    let mut bytes = Vec::new();
    reader
        .take(MAX_FILE_BYTES + 1)
        .read_to_end(&mut bytes)
        .map_err(ReadFailure::Io)?;
    if bytes.len() as u64 > MAX_FILE_BYTES {
        return Err(ReadFailure::TooLarge);
    }
    Ok(bytes)
}

/// The name that stands for standard input where a file is expected.
pub const STDIN: &str = "-";

/// Whether `path` names standard input (`-`).
pub fn is_stdin(path: &Path) -> bool {
    path.as_os_str() == STDIN
}

/// Standard input as read once: its bytes, or why it could not be had.
enum KeptStdin {
    Bytes(Vec<u8>),
    TooLarge,
    Failed(std::io::ErrorKind, String),
}

/// Standard input, read once under the size cap and kept for the rest of the run.
fn read_stdin() -> Result<Vec<u8>, ReadFailure> {
    static KEPT: OnceLock<KeptStdin> = OnceLock::new();
    let kept = KEPT.get_or_init(|| {
        note_stdin();
        match read_capped(std::io::stdin().lock()) {
            Ok(bytes) => KeptStdin::Bytes(bytes),
            Err(ReadFailure::Io(e)) => KeptStdin::Failed(e.kind(), e.to_string()),
            Err(_) => KeptStdin::TooLarge,
        }
    });
    match kept {
        KeptStdin::Bytes(bytes) => Ok(bytes.clone()),
        KeptStdin::TooLarge => Err(ReadFailure::TooLarge),
        KeptStdin::Failed(kind, why) => {
            Err(ReadFailure::Io(std::io::Error::new(*kind, why.clone())))
        }
    }
}

/// What names one file on this machine: its canonical path and, on Unix, its device and
/// inode, so a hard link or a second name of the same file is the same file.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct FileKey {
    /// The canonical path, when it could be had.
    pub canonical: Option<PathBuf>,
    /// Device and inode (Unix only).
    pub device_inode: Option<(u64, u64)>,
}

impl FileKey {
    /// The key of an open file reached through `path`.
    pub fn of_open(path: &Path, file: &std::fs::File) -> FileKey {
        FileKey {
            canonical: path.canonicalize().ok(),
            device_inode: file.metadata().ok().and_then(|m| device_inode(&m)),
        }
    }

    /// The key of the file `path` names (links followed), if it exists.
    pub fn of_path(path: &Path) -> Option<FileKey> {
        let metadata = std::fs::metadata(path).ok()?;
        Some(FileKey {
            canonical: path.canonicalize().ok(),
            device_inode: device_inode(&metadata),
        })
    }

    /// Whether the two keys name the same file.
    pub fn same_file(&self, other: &FileKey) -> bool {
        match (self.device_inode, other.device_inode) {
            (Some(a), Some(b)) => a == b,
            _ => self.canonical.is_some() && self.canonical == other.canonical,
        }
    }
}

/// Device and inode of a file's metadata.
#[cfg(unix)]
pub fn device_inode(metadata: &std::fs::Metadata) -> Option<(u64, u64)> {
    use std::os::unix::fs::MetadataExt;
    Some((metadata.dev(), metadata.ino()))
}

/// Device and inode of a file's metadata: none off Unix.
#[cfg(not(unix))]
pub fn device_inode(_metadata: &std::fs::Metadata) -> Option<(u64, u64)> {
    None
}

/// The files whose reading is remembered: the files this process will write (an existing
/// `--output` file), so a field of any size is read without a log that grows with it.
static WATCHED: Mutex<Vec<FileKey>> = Mutex::new(Vec::new());

/// Every watched file this process has read, as the path it was read by and its key; and
/// standard input when it is a regular file.
static READ_LOG: Mutex<Vec<(PathBuf, FileKey)>> = Mutex::new(Vec::new());

/// Remembers from now on whether this process reads the file `path` names (see
/// [`was_read`]); call it before reading anything.
pub fn watch(path: &Path) {
    if let (Some(key), Ok(mut watched)) = (FileKey::of_path(path), WATCHED.lock()) {
        watched.push(key);
    }
}

fn note_read(path: &Path, file: &std::fs::File) {
    let Ok(watched) = WATCHED.lock() else {
        return;
    };
    if watched.is_empty() {
        return;
    }
    let key = FileKey::of_open(path, file);
    if watched.iter().any(|w| w.same_file(&key))
        && let Ok(mut log) = READ_LOG.lock()
    {
        log.push((path.to_path_buf(), key));
    }
}

/// Notes standard input when it is a regular file (`< v.yaml`), so it is protected like one.
#[cfg(unix)]
fn note_stdin() {
    use std::os::fd::AsFd;
    let Ok(owned) = std::io::stdin().as_fd().try_clone_to_owned() else {
        return;
    };
    let Ok(metadata) = std::fs::File::from(owned).metadata() else {
        return;
    };
    if !metadata.is_file() {
        return;
    }
    let key = FileKey {
        canonical: None,
        device_inode: device_inode(&metadata),
    };
    if let Ok(mut log) = READ_LOG.lock() {
        log.push((PathBuf::from(STDIN), key));
    }
}

/// Standard input cannot be named off Unix.
#[cfg(not(unix))]
fn note_stdin() {}

/// The path by which this process read the file `key` names, if it read it: known for
/// standard input and for files [`watch`]ed before they were read.
pub fn was_read(key: &FileKey) -> Option<PathBuf> {
    let log = READ_LOG.lock().ok()?;
    log.iter()
        .find(|(_, read)| read.same_file(key))
        .map(|(path, _)| path.clone())
}

/// All files of one run, so spans can be resolved back to text.
#[derive(Debug, Default)]
pub struct SourceMap {
    files: Vec<SourceFile>,
    /// Texts that stand in for files on disk (an editor's unsaved buffers), by path as
    /// canonical as it could be had.
    open: Vec<(PathBuf, Arc<str>)>,
}

impl SourceMap {
    /// An empty map whose [`SourceMap::read`] takes each of these texts in place of the file
    /// at its path (the language server's open documents, read before they are saved).
    pub fn with_open(open: Vec<(PathBuf, String)>) -> SourceMap {
        SourceMap {
            files: Vec::new(),
            open: open
                .into_iter()
                .map(|(path, text)| (canonical_or_same(&path), text.into()))
                .collect(),
        }
    }

    /// The text standing in for `path`, if it is open.
    fn open_text(&self, path: &Path) -> Option<Arc<str>> {
        if self.open.is_empty() {
            return None;
        }
        let key = canonical_or_same(path);
        self.open
            .iter()
            .find(|(p, _)| *p == key)
            .map(|(_, text)| text.clone())
    }

    /// Adds text under a path and returns its id.
    pub fn add(&mut self, path: PathBuf, text: String) -> FileId {
        self.files.push(SourceFile::new(path, text.into()));
        FileId::try_from(self.files.len() - 1).unwrap_or(FileId::MAX)
    }

    /// Reads a file from disk, or standard input when the path is [`STDIN`], refusing text
    /// that is too large or not UTF-8. The cap holds on the bytes actually read, so a pipe or
    /// a device (`/dev/zero`) that reports no size is refused after [`MAX_FILE_BYTES`] bytes
    /// rather than read whole. Standard input is read once and kept, so a declaration read
    /// against two editions reads the same text twice. Every file opened is noted in the
    /// [`was_read`] log.
    pub fn read(&mut self, path: &Path) -> Result<FileId, ReadFailure> {
        if let Some(text) = self.open_text(path) {
            self.files.push(SourceFile::new(path.to_path_buf(), text));
            return Ok(FileId::try_from(self.files.len() - 1).unwrap_or(FileId::MAX));
        }
        let bytes = if is_stdin(path) {
            read_stdin()?
        } else {
            let file = std::fs::File::open(path).map_err(ReadFailure::Io)?;
            note_read(path, &file);
            read_capped(file)?
        };
        let text = String::from_utf8(bytes).map_err(|e| {
            ReadFailure::NotUtf8(BadByte::find(e.as_bytes(), e.utf8_error().valid_up_to()))
        })?;
        Ok(self.add(path.to_path_buf(), text))
    }

    /// The file with this id.
    pub fn file(&self, id: FileId) -> &SourceFile {
        &self.files[id as usize]
    }

    /// The id of a file already loaded from this path, if any.
    pub fn find(&self, path: &Path) -> Option<FileId> {
        self.files
            .iter()
            .position(|f| f.path == path)
            .and_then(|i| FileId::try_from(i).ok())
    }

    /// The text a span covers.
    pub fn slice(&self, span: Span) -> &str {
        let text = &self.file(span.file).text;
        let start = floor_char_boundary(text, span.start);
        let end = floor_char_boundary(text, span.end.max(start));
        &text[start..end]
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn spans_are_equal_only_when_they_cover_the_same_bytes() {
        assert_eq!(Span::new(0, 3, 7), Span::new(0, 3, 7));
        assert_ne!(Span::new(0, 3, 7), Span::new(0, 4, 7));
        assert_ne!(Span::new(0, 3, 7), Span::new(0, 3, 8));
        assert_ne!(Span::new(0, 3, 7), Span::new(1, 3, 7));
    }

    #[test]
    fn line_and_column_are_one_based_and_count_characters() {
        let mut map = SourceMap::default();
        let id = map.add("a.rules".into(), "ab\n±cd".into());
        let file = map.file(id);
        assert_eq!(file.line_column(0), (1, 1));
        assert_eq!(file.line_column(3), (2, 1));
        // "±" is two bytes; `c` is the second character of line 2
        assert_eq!(file.line_column(5), (2, 2));
    }

    #[test]
    fn the_size_cap_holds_on_the_bytes_read() {
        let limit = usize::try_from(MAX_FILE_BYTES).unwrap_or(usize::MAX);
        // an endless reader, as `/dev/zero` or a pipe that reports no size would be
        let endless = std::io::repeat(b'#');
        assert!(matches!(read_capped(endless), Err(ReadFailure::TooLarge)));
        let exactly = std::io::repeat(b'#').take(MAX_FILE_BYTES);
        assert_eq!(read_capped(exactly).map(|b| b.len()).ok(), Some(limit));
    }

    #[cfg(unix)]
    #[test]
    fn a_device_that_never_ends_is_refused() {
        let mut map = SourceMap::default();
        let read = map.read(Path::new("/dev/zero"));
        assert!(matches!(read, Err(ReadFailure::TooLarge)), "{read:?}");
    }
}
