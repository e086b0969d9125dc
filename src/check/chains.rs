//! How deep derived values stand on one another: a `define` that reads only measurements
//! stands 1 deep, one that reads it 2, and so on. Every depth is measured in one pass over
//! the definitions (an explicit stack, so a chain of any length costs linear time and no
//! recursion), before any is typed; a derived value more than [`MAX_DEFINE_DEPTH`] deep is
//! refused where the chain first passes the cap, and those above it are left untyped, so
//! typing, folding and evaluation never follow a chain longer than the cap.

use std::collections::{HashMap, HashSet};

use super::Checker;
use super::error::CheckError;

/// Deepest a derived value may stand on others. A rulebook's derived values stand a few
/// deep (displacement from the largest bore, a ratio from two of them).
pub const MAX_DEFINE_DEPTH: usize = 64;

impl<'a> Checker<'a> {
    /// Measures every derived value's depth and refuses each that stands exactly one past
    /// [`MAX_DEFINE_DEPTH`] (those deeper read one of them and are not reported again).
    pub(super) fn measure_define_chains(&mut self) {
        let reads: HashMap<&'a str, Vec<&'a str>> = self
            .define_order
            .iter()
            .filter_map(|name| {
                let define = self.defines.get(name)?;
                let mut names = Vec::new();
                define.expr.names(&mut names);
                names.retain(|n| self.defines.contains_key(n));
                Some((*name, names))
            })
            .collect();
        let depths = depths(&self.define_order, &reads);
        for (name, read) in &reads {
            if depths.get(name).is_some_and(|d| *d > MAX_DEFINE_DEPTH) {
                // left untyped, but what it reads is read: no warning that it is unused
                self.used.extend(read.iter().map(|r| r.to_string()));
                self.used.insert(name.to_string());
            }
        }
        for name in &self.define_order {
            let (Some(depth), Some(define)) = (depths.get(name), self.defines.get(name)) else {
                continue;
            };
            if *depth == MAX_DEFINE_DEPTH + 1 {
                self.problems.push(
                    CheckError::DefineTooDeep {
                        name: name.to_string(),
                        limit: MAX_DEFINE_DEPTH,
                        at: define.name.span,
                    }
                    .into(),
                );
            }
        }
        self.define_depths = depths;
    }

    /// Whether the derived value stands deeper than the cap (and is left untyped).
    pub(super) fn too_deep(&self, name: &str) -> bool {
        self.define_depths
            .get(name)
            .is_some_and(|d| *d > MAX_DEFINE_DEPTH)
    }
}

/// The depth of every derived value, `reads` giving the derived values each one reads. A
/// value read back inside a loop counts as 0 deep there (the loop is reported by typing).
fn depths<'a>(
    order: &[&'a str],
    reads: &HashMap<&'a str, Vec<&'a str>>,
) -> HashMap<&'a str, usize> {
    let none = Vec::new();
    let mut depth: HashMap<&'a str, usize> = HashMap::with_capacity(order.len());
    let mut open: HashSet<&'a str> = HashSet::new();
    for root in order {
        if depth.contains_key(root) {
            continue;
        }
        open.insert(root);
        let mut stack: Vec<(&'a str, usize)> = vec![(root, 0)];
        while let Some((node, next)) = stack.last_mut() {
            let children = reads.get(node).unwrap_or(&none);
            if let Some(child) = children.get(*next) {
                *next += 1;
                if !depth.contains_key(child) && open.insert(child) {
                    stack.push((child, 0));
                }
                continue;
            }
            let deepest = children
                .iter()
                .map(|c| depth.get(c).copied().unwrap_or(0))
                .max()
                .unwrap_or(0);
            let node = *node;
            depth.insert(node, deepest + 1);
            open.remove(node);
            stack.pop();
        }
    }
    depth
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_chain_in_either_order_and_a_loop_are_measured_without_recursion() {
        let n = 200_000;
        let names: Vec<String> = (0..n).map(|i| format!("d{i}")).collect();
        let order: Vec<&str> = names.iter().map(String::as_str).collect();
        // d(i) reads d(i - 1): written in order and, below, in reverse
        let reads: HashMap<&str, Vec<&str>> =
            (1..n).map(|i| (order[i], vec![order[i - 1]])).collect();
        let forward = depths(&order, &reads);
        assert_eq!(forward.get("d0"), Some(&1));
        assert_eq!(forward.get(order[n - 1]), Some(&n));
        let reversed: Vec<&str> = order.iter().rev().copied().collect();
        assert_eq!(depths(&reversed, &reads), forward);
        // a = b, b = a: each counts the other once
        let looped: HashMap<&str, Vec<&str>> = [("a", vec!["b"]), ("b", vec!["a"])].into();
        let d = depths(&["a", "b"], &looped);
        assert_eq!((d.get("a"), d.get("b")), (Some(&2), Some(&1)));
    }
}
