//! Static checks (in progress).
