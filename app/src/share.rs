//! Share links: a design in the URL fragment (being written).
