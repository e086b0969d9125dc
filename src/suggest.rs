//! "Did you mean" suggestions: the known name nearest to a misspelt one.

/// The candidate closest to `word` by Jaro-Winkler similarity, if any is close enough to be a
/// plausible typo. Case is ignored for the comparison, not for the answer.
pub fn closest<'a>(word: &str, candidates: impl IntoIterator<Item = &'a str>) -> Option<&'a str> {
    let lower = word.to_lowercase();
    candidates
        .into_iter()
        .map(|c| (strsim::jaro_winkler(&lower, &c.to_lowercase()), c))
        .filter(|(score, _)| *score >= 0.8)
        .max_by(|a, b| a.0.total_cmp(&b.0))
        .map(|(_, c)| c)
}

#[cfg(test)]
mod tests {
    use super::closest;

    #[test]
    fn finds_a_near_name_and_rejects_a_far_one() {
        let names = ["displacement", "stroke", "bore"];
        assert_eq!(closest("displacment", names), Some("displacement"));
        assert_eq!(closest("weight", names), None);
    }
}
