//! Where in a declaration a node is: the keys leading to it and, in a per-cylinder list, the
//! cylinder. Shown the way the reports name an input (`measurements.bore[1]` is cylinder 1),
//! and used by the loader to name a node to skip when the file is read again.

use std::fmt;

/// One step down into a declaration.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
enum Step {
    /// A mapping key as written, shared: a path is copied for every node below it, and the
    /// copy then only counts references to its keys.
    Key(std::sync::Arc<str>),
    /// `value:` or `values:` in a measurement's mapping: part of the node's identity, not
    /// shown (the value is the measurement's).
    Wrapper(&'static str),
    /// An element of a per-cylinder list, counting cylinders from 1.
    Cylinder(usize),
}

/// The path from the top of a declaration to one node.
#[derive(Clone, Debug, Default, PartialEq, Eq, Hash)]
pub struct DeclPath(Vec<Step>);

impl DeclPath {
    /// The top of the file.
    pub fn root() -> DeclPath {
        DeclPath::default()
    }

    /// The node under `key`.
    pub fn key(&self, key: &str) -> DeclPath {
        self.with(Step::Key(key.into()))
    }

    /// The node under `value:` or `values:` of a measurement.
    pub fn wrapper(&self, key: &'static str) -> DeclPath {
        self.with(Step::Wrapper(key))
    }

    /// The element at `index` (from 0) of a per-cylinder list: cylinder `index + 1`.
    pub fn element(&self, index: usize) -> DeclPath {
        self.with(Step::Cylinder(index + 1))
    }

    /// The path of the mapping that holds this node.
    pub fn parent(&self) -> DeclPath {
        let mut steps = self.0.clone();
        steps.pop();
        DeclPath(steps)
    }

    /// Whether this is the top of the file.
    pub fn is_root(&self) -> bool {
        self.0.iter().all(|s| matches!(s, Step::Wrapper(_)))
    }

    fn with(&self, step: Step) -> DeclPath {
        let mut steps = self.0.clone();
        steps.push(step);
        DeclPath(steps)
    }
}

impl fmt::Display for DeclPath {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let mut first = true;
        for step in &self.0 {
            match step {
                Step::Key(k) if first => f.write_str(k)?,
                Step::Key(k) => write!(f, ".{k}")?,
                Step::Wrapper(_) => continue,
                Step::Cylinder(c) => write!(f, "[{c}]")?,
            }
            first = false;
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::DeclPath;

    #[test]
    fn a_list_element_is_named_by_its_cylinder_from_one() {
        let bore = DeclPath::root().key("measurements").key("bore");
        assert_eq!(
            bore.wrapper("values").element(0).to_string(),
            "measurements.bore[1]"
        );
        assert_eq!(bore.element(7).to_string(), "measurements.bore[8]");
        assert_eq!(bore.wrapper("value").to_string(), "measurements.bore");
        assert_ne!(
            bore.wrapper("value"),
            bore,
            "the wrapper is part of the identity"
        );
        assert_eq!(bore.parent().to_string(), "measurements");
        assert!(DeclPath::root().is_root());
    }
}
