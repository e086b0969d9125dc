//! Where a command's document goes, and the rules that keep writing it from costing the user
//! a file. Every command writes through here.
//!
//! - `--output -`, or no `--output`, is standard output. A failed write there is a problem
//!   (`W05 write-failed`); a closed pipe (the reader went away) is not, and stays quiet.
//! - A regular file is replaced atomically: the text goes to a temporary file beside it,
//!   which is synced, given the mode of the file it replaces, and renamed over it; the folder
//!   is then synced. A new file is made the same way.
//! - A file this run read (a declaration, a rulebook, an include, standard input redirected
//!   from a file) is never written: it is refused (`W01 output-is-input`), by device and
//!   inode on Unix, so a hard link or another spelling of the path is caught too.
//! - A read-only file is refused (`W02 output-read-only`), never replaced with a new mode.
//! - A symbolic link is written through: the file it names is replaced and the link stays.
//!   A link that leads nowhere is refused (`W04 output-dangling-link`).
//! - A device, a FIFO, a socket, or any path under `/dev` or `/proc` (`/dev/stdout`) is
//!   opened and written directly, never renamed over, so no device node is ever replaced.
//! - A folder is refused (`W03 output-not-a-file`).
//! - One exception to "never an input": `gonogo fmt --write` puts a rulebook's canonical text
//!   back in the file it read ([`rewrite_input`]). Only a regular file (or a link to one) is
//!   rewritten, atomically and with its mode as above, and only when it still holds exactly
//!   the text that was read: a file changed meanwhile is left alone (`W07 input-changed`),
//!   so an edit saved while gonogo ran is never lost. Standard input cannot be written back
//!   (`W08 rewrite-stdin`).
//! - A long document (`check` over a field) is written as it is made, into a [`Pending`]: a
//!   temporary file beside the target, renamed over it only when the whole run succeeded,
//!   or for standard output and devices a spool (memory, then an unlinked temporary file)
//!   copied there at the end. A run that fails half-way leaves the target as it was.

use std::fs::{self, OpenOptions, Permissions};
use std::io::{BufWriter, ErrorKind, IsTerminal, Seek, Write};
use std::path::{Path, PathBuf};

use crate::diagnostic::Problem;
use crate::diagnostic::codes::write as codes;
use crate::source::{FileKey, STDIN, was_read};

/// Where a command's document is written.
#[derive(Debug)]
pub enum Destination {
    /// Standard output.
    Stdout,
    /// A file, a link to one, or a device.
    File(Target),
}

/// A `--output` path, looked at before the command runs.
#[derive(Debug)]
pub struct Target {
    /// The path as the user gave it.
    given: PathBuf,
    /// What is there, and so how it is written.
    kind: Kind,
}

#[derive(Debug)]
enum Kind {
    /// Nothing there yet: made at this path, atomically.
    New(PathBuf),
    /// A regular file (reached through links, if any): replaced atomically at its own path,
    /// with its permissions.
    Replace(PathBuf, Permissions),
    /// A device, FIFO, socket, or a path under `/dev` or `/proc`: opened and written.
    Direct(PathBuf),
}

impl Destination {
    /// The destination `--output` names: standard output for none or `-`, else the file,
    /// refused at once when it is a folder, read-only, or a link that leads nowhere.
    pub fn resolve(output: Option<&Path>) -> Result<Destination, Problem> {
        match output {
            None => Ok(Destination::Stdout),
            Some(path) if path.as_os_str() == STDIN => Ok(Destination::Stdout),
            Some(path) => Target::resolve(path).map(Destination::File),
        }
    }

    /// Whether the document goes to a terminal (colour may be used).
    pub fn is_terminal(&self) -> bool {
        matches!(self, Destination::Stdout) && std::io::stdout().is_terminal()
    }

    /// Writes the document, or says why it could not be written.
    pub fn write(&self, text: &str) -> Result<(), Problem> {
        match self {
            Destination::Stdout => to_stdout(text),
            Destination::File(target) => target.write(text.as_bytes()),
        }
    }

    /// A document to be written here bit by bit and given over only by [`Pending::commit`].
    /// A file's temporary twin is made at the first write, so it is never among the files a
    /// run reads from the target's folder.
    pub fn pending(&self) -> Result<Pending<'_>, Problem> {
        let spool = match self {
            Destination::File(Target {
                kind: Kind::New(path) | Kind::Replace(path, _),
                ..
            }) => Spool::Beside(None, path.clone()),
            _ => Spool::Anywhere(tempfile::SpooledTempFile::new(STDOUT_IN_MEMORY)),
        };
        Ok(Pending {
            destination: self,
            spool,
        })
    }
}

/// Bytes of a document for standard output or a device kept in memory before the rest
/// goes to an unlinked temporary file.
const STDOUT_IN_MEMORY: usize = 1 << 20;

/// A document on its way to a [`Destination`]: written with [`Write`], given over by
/// [`Pending::commit`]. Dropped without a commit, it leaves the destination untouched and
/// its temporary file is removed.
pub struct Pending<'d> {
    destination: &'d Destination,
    spool: Spool,
}

enum Spool {
    /// A temporary file beside the target (made at the first write), renamed over it at
    /// the end.
    Beside(Option<BufWriter<Twin>>, PathBuf),
    /// Memory, then an unlinked temporary file; copied to standard output or a device.
    Anywhere(tempfile::SpooledTempFile),
}

impl Write for Pending<'_> {
    fn write(&mut self, bytes: &[u8]) -> std::io::Result<usize> {
        match &mut self.spool {
            Spool::Beside(Some(file), _) => file.write(bytes),
            Spool::Beside(twin, path) => twin
                .insert(BufWriter::new(Twin::beside(path)?))
                .write(bytes),
            Spool::Anywhere(spool) => spool.write(bytes),
        }
    }

    fn flush(&mut self) -> std::io::Result<()> {
        match &mut self.spool {
            Spool::Beside(Some(file), _) => file.flush(),
            Spool::Beside(None, _) => Ok(()),
            Spool::Anywhere(spool) => spool.flush(),
        }
    }
}

impl Pending<'_> {
    /// Gives the whole document to its destination: renames the temporary file over the
    /// target (refused, and nothing written, when the target is a file this run read), or
    /// copies the spool to standard output or the device.
    pub fn commit(self) -> Result<(), Problem> {
        match (self.spool, self.destination) {
            (Spool::Beside(file, path), Destination::File(target)) => {
                target.refuse_an_input()?;
                let twin = match file {
                    Some(file) => file.into_inner().map_err(|e| e.into_error()),
                    // an empty document still replaces the target
                    None => Twin::beside(&path),
                }
                .map_err(|e| write_failed(&target.given, &e))?;
                let permissions = match &target.kind {
                    Kind::Replace(_, permissions) => Some(permissions.clone()),
                    _ => None,
                };
                twin.persist(permissions)
                    .map_err(|e| write_failed(&target.given, &e))
            }
            (Spool::Anywhere(mut spool), Destination::File(target)) => {
                target.refuse_an_input()?;
                spool
                    .rewind()
                    .and_then(|()| copy_directly(&target.path(), &mut spool))
                    .map_err(|e| write_failed(&target.given, &e))
            }
            (Spool::Anywhere(mut spool), Destination::Stdout) => copy_to_stdout(&mut spool),
            // a twin is only made for a file
            (Spool::Beside(..), Destination::Stdout) => Ok(()),
        }
    }
}

/// A failure to write a run's spool, which holds the document until the run ends: in memory,
/// then a temporary file in `$TMPDIR` (or beside `--output`).
pub fn spool_failed(e: &std::io::Error) -> Problem {
    Problem::unlocated(
        codes::WRITE_FAILED,
        format!(
            "cannot write the report as it is made (temporary folder `{}`): {e}",
            std::env::temp_dir().display()
        ),
    )
    .with_help(
        "check that the temporary folder ($TMPDIR) and the output's folder exist and have room",
    )
}

impl Target {
    fn resolve(given: &Path) -> Result<Target, Problem> {
        let target = |kind| Target {
            given: given.to_path_buf(),
            kind,
        };
        let link = match fs::symlink_metadata(given) {
            Err(e) if e.kind() == ErrorKind::NotFound => {
                return Ok(target(Kind::New(given.to_path_buf())));
            }
            Err(e) => return Err(write_failed(given, &e)),
            Ok(m) => m,
        };
        let Ok(metadata) = fs::metadata(given) else {
            return Err(dangling(given));
        };
        if metadata.is_dir() {
            return Err(Problem::unlocated(
                codes::OUTPUT_NOT_A_FILE,
                format!("`{}` is a folder", given.display()),
            )
            .with_help("name a file to write to, in a folder that exists"));
        }
        if metadata.is_file() {
            crate::source::watch(given);
        }
        if !metadata.is_file() || is_system_path(given) {
            return Ok(target(Kind::Direct(given.to_path_buf())));
        }
        let path = if link.file_type().is_symlink() {
            fs::canonicalize(given).map_err(|e| write_failed(given, &e))?
        } else {
            given.to_path_buf()
        };
        if is_read_only(&path, &metadata) {
            return Err(Problem::unlocated(
                codes::OUTPUT_READ_ONLY,
                format!(
                    "`{}` is read-only, so gonogo leaves it as it is",
                    given.display()
                ),
            )
            .with_help("make it writable first (`chmod u+w`), or write to another file"));
        }
        Ok(target(Kind::Replace(path, metadata.permissions())))
    }

    fn write(&self, bytes: &[u8]) -> Result<(), Problem> {
        self.refuse_an_input()?;
        let written = match &self.kind {
            Kind::New(path) => replace_atomically(path, bytes, None),
            Kind::Replace(path, permissions) => {
                replace_atomically(path, bytes, Some(permissions.clone()))
            }
            Kind::Direct(path) => write_directly(path, bytes),
        };
        written.map_err(|e| write_failed(&self.given, &e))
    }

    /// The path written to.
    fn path(&self) -> PathBuf {
        match &self.kind {
            Kind::New(path) | Kind::Replace(path, _) | Kind::Direct(path) => path.clone(),
        }
    }

    /// Refuses a target that names a file this run has read, however it was named.
    fn refuse_an_input(&self) -> Result<(), Problem> {
        let is_file = fs::metadata(&self.given).is_ok_and(|m| m.is_file());
        let Some(key) = FileKey::of_path(&self.given).filter(|_| is_file) else {
            return Ok(());
        };
        let Some(input) = was_read(&key) else {
            return Ok(());
        };
        let read_as = if input == self.given {
            String::new()
        } else if input.as_os_str() == STDIN {
            " (read as standard input)".to_string()
        } else {
            format!(" (read as `{}`)", input.display())
        };
        Err(Problem::unlocated(
            codes::OUTPUT_IS_INPUT,
            format!(
                "`--output {}` names a file this run reads{read_as}; nothing was written",
                self.given.display()
            ),
        )
        .with_help("write to another file: gonogo never writes over one of its inputs"))
    }
}

/// Replaces the file at `path`, which this run read as `read`, with `text`: atomically, with
/// its mode, through a link to the file it names; refused when the file now holds anything
/// but `read`, is read-only, is no regular file, or is standard input. Nothing is written when
/// refused.
pub fn rewrite_input(path: &Path, read: &str, text: &str) -> Result<(), Problem> {
    if path.as_os_str() == STDIN {
        return Err(Problem::unlocated(
            codes::REWRITE_STDIN,
            "standard input cannot be written back",
        )
        .with_help("name the rulebook file, or leave out `--write` to print the text"));
    }
    let target = Target::resolve(path)?;
    let Kind::Replace(real, permissions) = &target.kind else {
        return Err(Problem::unlocated(
            codes::OUTPUT_NOT_A_FILE,
            format!("`{}` is not a regular file", path.display()),
        )
        .with_help("format a rulebook file; devices and pipes are never rewritten"));
    };
    let now = fs::read(real).map_err(|e| write_failed(path, &e))?;
    if now != read.as_bytes() {
        return Err(Problem::unlocated(
            codes::INPUT_CHANGED,
            format!(
                "`{}` changed while it was being formatted; it was left as it is",
                path.display()
            ),
        )
        .with_help("run the command again on the file as it is now"));
    }
    replace_atomically(real, text.as_bytes(), Some(permissions.clone()))
        .map_err(|e| write_failed(path, &e))
}

/// Writes `text` to standard output. A closed pipe is not a failure: the reader has gone.
pub fn to_stdout(text: &str) -> Result<(), Problem> {
    let mut out = std::io::stdout().lock();
    stdout_written(out.write_all(text.as_bytes()).and_then(|()| out.flush()))
}

/// A write to standard output as a problem, or none: a closed pipe is not a failure, the
/// reader has gone.
fn stdout_written(written: std::io::Result<()>) -> Result<(), Problem> {
    match written {
        Err(e) if e.kind() != ErrorKind::BrokenPipe => Err(Problem::unlocated(
            codes::WRITE_FAILED,
            format!("cannot write to standard output: {e}"),
        )
        .with_help("check that the disk or device standard output goes to has room")),
        _ => Ok(()),
    }
}

/// Writes `text` to standard error. A failure there cannot be reported anywhere, so it is
/// ignored (never a panic); the exit status still tells.
pub fn to_stderr(text: &str) {
    let mut err = std::io::stderr().lock();
    let _ = err.write_all(text.as_bytes()).and_then(|()| err.flush());
}

/// Paths written directly whatever they lead to: `/dev/stdout` names whatever standard
/// output is, and must never be renamed over.
fn is_system_path(path: &Path) -> bool {
    path.starts_with("/dev") || path.starts_with("/proc")
}

/// Whether the file may not be written: no write permission at all, or none for this user.
fn is_read_only(path: &Path, metadata: &fs::Metadata) -> bool {
    metadata.permissions().readonly()
        || OpenOptions::new()
            .write(true)
            .open(path)
            .is_err_and(|e| e.kind() == ErrorKind::PermissionDenied)
}

fn dangling(given: &Path) -> Problem {
    let to = fs::read_link(given)
        .map(|t| format!(" to `{}`", t.display()))
        .unwrap_or_default();
    Problem::unlocated(
        codes::OUTPUT_DANGLING_LINK,
        format!("`{}` is a link{to} that leads to no file", given.display()),
    )
    .with_help("write to the file itself, or make the link lead to one")
}

fn write_failed(path: &Path, e: &std::io::Error) -> Problem {
    Problem::unlocated(
        codes::WRITE_FAILED,
        format!("cannot write `{}`: {e}", path.display()),
    )
    .with_help("check that the folder exists, may be written and has room")
}

/// Writes `bytes` to a new file beside `path`, syncs it, gives it `permissions`, renames it
/// over `path` and syncs the folder. The temporary file is removed on failure.
fn replace_atomically(
    path: &Path,
    bytes: &[u8],
    permissions: Option<Permissions>,
) -> std::io::Result<()> {
    let mut twin = Twin::beside(path)?;
    twin.write_all(bytes)?;
    twin.persist(permissions)
}

/// Twins not yet renamed into place, by path: removed by [`abandon`] when the process is
/// interrupted, which no destructor sees.
static UNFINISHED: std::sync::Mutex<Vec<PathBuf>> = std::sync::Mutex::new(Vec::new());

/// Removes every temporary twin not yet renamed into place and ends the process with `code`;
/// for an interrupted run (Ctrl-C, SIGTERM), so it leaves each target as it was, or finished
/// if its rename had already happened, and no `.partial` file beside it. The list stays locked
/// until the process has ended, so no new twin can be made after the sweep.
pub fn abandon(code: i32) -> ! {
    let mut unfinished = UNFINISHED.lock().unwrap_or_else(|e| e.into_inner());
    for path in unfinished.drain(..) {
        let _ = fs::remove_file(path);
    }
    std::process::exit(code)
}

/// The temporary file that becomes a target: made in the target's folder (so the rename is
/// atomic) under a hidden name ending `.partial`, removed if dropped before [`Twin::persist`]
/// or if the process is interrupted ([`abandon`]).
pub struct Twin {
    file: tempfile::NamedTempFile,
    path: PathBuf,
    folder: PathBuf,
}

impl Twin {
    /// A new twin for `path`, with the mode a new file would get (0666 less the umask).
    fn beside(path: &Path) -> std::io::Result<Twin> {
        let folder = match path.parent() {
            Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
            _ => PathBuf::from("."),
        };
        let name = path
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default();
        let prefix = format!(".{name}.");
        let mut builder = tempfile::Builder::new();
        builder.prefix(&prefix).suffix(".partial");
        #[cfg(unix)]
        {
            use std::os::unix::fs::PermissionsExt;
            builder.permissions(Permissions::from_mode(0o666));
        }
        // made and listed under one lock, so an interruption never sees a twin it cannot
        // find (the handler waits for the lock)
        let mut unfinished = UNFINISHED.lock().unwrap_or_else(|e| e.into_inner());
        let file = builder.tempfile_in(&folder).map_err(|e| {
            std::io::Error::new(
                e.kind(),
                format!(
                    "cannot make a temporary file in `{}`: {e}",
                    folder.display()
                ),
            )
        })?;
        unfinished.push(file.path().to_path_buf());
        drop(unfinished);
        Ok(Twin {
            file,
            path: path.to_path_buf(),
            folder,
        })
    }

    /// Syncs the twin, gives it `permissions`, renames it over the target and syncs the
    /// folder.
    fn persist(self, permissions: Option<Permissions>) -> std::io::Result<()> {
        if let Some(permissions) = permissions {
            self.file.as_file().set_permissions(permissions)?;
        }
        self.file.as_file().sync_all()?;
        // unlisted and renamed under one lock: an interruption sees either a listed twin
        // (removed, the target as it was) or the finished target, never a twin left behind
        let mut unfinished = UNFINISHED.lock().unwrap_or_else(|e| e.into_inner());
        unfinished.retain(|p| p != self.file.path());
        let renamed = self.file.persist(&self.path).map_err(|e| e.error);
        drop(unfinished);
        renamed?;
        sync_folder(&self.folder)
    }
}

impl Write for Twin {
    fn write(&mut self, bytes: &[u8]) -> std::io::Result<usize> {
        self.file.write(bytes)
    }

    fn flush(&mut self) -> std::io::Result<()> {
        self.file.flush()
    }
}

/// Syncs a folder so a rename in it survives a crash (Unix; elsewhere nothing to do).
fn sync_folder(folder: &Path) -> std::io::Result<()> {
    #[cfg(unix)]
    {
        fs::File::open(folder)?.sync_all()
    }
    #[cfg(not(unix))]
    {
        let _ = folder;
        Ok(())
    }
}

/// Opens an existing device, FIFO or system path and writes to it; a regular file reached
/// this way is truncated first, so no old text is left after the new.
fn write_directly(path: &Path, mut bytes: &[u8]) -> std::io::Result<()> {
    copy_directly(path, &mut bytes)
}

/// [`write_directly`] for a spooled document (or any reader).
fn copy_directly(path: &Path, spool: &mut impl std::io::Read) -> std::io::Result<()> {
    let regular = fs::metadata(path).is_ok_and(|m| m.is_file());
    let mut file = OpenOptions::new()
        .write(true)
        .truncate(regular)
        .open(path)?;
    std::io::copy(spool, &mut file)?;
    file.flush()
}

/// [`to_stdout`] for a spooled document.
fn copy_to_stdout(spool: &mut tempfile::SpooledTempFile) -> Result<(), Problem> {
    stdout_written(spool.rewind().and_then(|()| {
        let mut out = std::io::stdout().lock();
        std::io::copy(spool, &mut out).and_then(|_| out.flush())
    }))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_dash_and_no_output_are_standard_output() {
        assert!(matches!(
            Destination::resolve(Some(Path::new("-"))),
            Ok(Destination::Stdout)
        ));
        assert!(matches!(
            Destination::resolve(None),
            Ok(Destination::Stdout)
        ));
    }

    #[cfg(unix)]
    #[test]
    fn devices_are_written_directly() {
        let resolved = Destination::resolve(Some(Path::new("/dev/null")));
        assert!(
            matches!(
                &resolved,
                Ok(Destination::File(Target {
                    kind: Kind::Direct(_),
                    ..
                }))
            ),
            "{resolved:?}"
        );
    }

    #[test]
    fn a_folder_is_refused() {
        let resolved = Destination::resolve(Some(&std::env::temp_dir()));
        assert!(
            matches!(&resolved, Err(p) if p.code == codes::OUTPUT_NOT_A_FILE),
            "{resolved:?}"
        );
    }
}
