//! Reading a parsed JSON document into its typed form, naming where the first error is.
//!
//! [`from_value`] is serde's deserialisation from a [`serde_json::Value`] with
//! one addition: an error carries the path of the value it is about
//! (`recipe.salts[1].form`), built on the way out as the error passes each
//! enclosing key and index. Paths read `key.key[index].key`; an error about a
//! key itself (an unknown field) ends with that key. Errors raised inside an
//! internally tagged object (one with a `kind`) stop at that object: serde
//! reads such objects through its own buffer.
//!
//! One deserialiser for every document type keeps the page small: each
//! derived `Deserialize` is instantiated once, for this deserialiser only.

use crate::error::{shorten_quoted, SolverError};
use crate::fmt::{clip, QUOTE_MAX};
use serde::de::{
    self, DeserializeOwned, DeserializeSeed, EnumAccess, MapAccess, SeqAccess, VariantAccess,
    Visitor,
};
use serde::forward_to_deserialize_any;
use serde_json::{Map, Value};
use std::fmt;

/// A deserialisation error with the path of the value it is about.
#[derive(Debug, Clone, PartialEq)]
pub struct PathError {
    /// What went wrong (serde's message).
    pub message: String,
    /// Segments from the innermost out (reversed while the error travels up).
    segments: Vec<Segment>,
}

#[derive(Debug, Clone, PartialEq)]
enum Segment {
    Key(String),
    Index(usize),
}

impl PathError {
    /// The path: `.` for the document itself, else `a.b[2].c`.
    pub fn path(&self) -> String {
        if self.segments.is_empty() {
            return ".".into();
        }
        let mut out = String::new();
        for s in self.segments.iter().rev() {
            match s {
                Segment::Key(k) => {
                    if !out.is_empty() {
                        out.push('.');
                    }
                    out.push_str(k);
                }
                Segment::Index(i) => {
                    out.push('[');
                    out.push_str(&i.to_string());
                    out.push(']');
                }
            }
        }
        out
    }

    fn within(mut self, s: Segment) -> Self {
        self.segments.push(s);
        self
    }
}

impl fmt::Display for PathError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.message)
    }
}

impl std::error::Error for PathError {}

impl de::Error for PathError {
    fn custom<T: fmt::Display>(msg: T) -> Self {
        PathError {
            message: msg.to_string(),
            segments: Vec::new(),
        }
    }
}

/// Read `value` as a `T`.
///
/// # Errors
///
/// The first error serde meets, with its path ([`PathError::path`]).
pub fn from_value<T: DeserializeOwned>(value: &Value) -> Result<T, PathError> {
    T::deserialize(At(value))
}

/// A value being read.
struct At<'a>(&'a Value);

impl<'de> de::Deserializer<'de> for At<'de> {
    type Error = PathError;

    /// Whatever the value is: the visit of its own kind (below).
    fn deserialize_any<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        match self.0 {
            Value::Null => self.deserialize_unit(visitor),
            Value::Bool(_) => self.deserialize_bool(visitor),
            Value::Number(_) => self.deserialize_f64(visitor),
            Value::String(_) => self.deserialize_str(visitor),
            Value::Array(_) => self.deserialize_seq(visitor),
            Value::Object(_) => self.deserialize_map(visitor),
        }
    }

    fn deserialize_option<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        match self.0 {
            Value::Null => visitor.visit_none(),
            _ => visitor.visit_some(self),
        }
    }

    fn deserialize_newtype_struct<V: Visitor<'de>>(
        self,
        _name: &'static str,
        visitor: V,
    ) -> Result<V::Value, PathError> {
        visitor.visit_newtype_struct(self)
    }

    fn deserialize_enum<V: Visitor<'de>>(
        self,
        _name: &'static str,
        _variants: &'static [&'static str],
        visitor: V,
    ) -> Result<V::Value, PathError> {
        match self.0 {
            Value::String(s) => visitor.visit_enum(Variant {
                name: s,
                content: None,
            }),
            Value::Object(map) if map.len() == 1 => match map.iter().next() {
                Some((k, v)) => visitor
                    .visit_enum(Variant {
                        name: k,
                        content: Some(v),
                    })
                    .map_err(|e| e.within(Segment::Key(k.clone()))),
                None => Err(de::Error::custom(
                    "empty object where a variant was expected",
                )),
            },
            other => Err(de::Error::invalid_type(
                unexpected(other),
                &"a variant name",
            )),
        }
    }

    // Each kind asks only for its own visit: a struct is read from an object
    // only, a number from a number. The derived code then carries no unused
    // paths (a struct read from an array, say) into the page, and a value of
    // the wrong kind gets serde's usual "invalid type: ..., expected ..." message.

    fn deserialize_bool<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        match self.0 {
            Value::Bool(b) => visitor.visit_bool(*b),
            other => Err(wrong_kind(other, &visitor)),
        }
    }

    fn deserialize_f64<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        match self.0 {
            Value::Number(n) => {
                if let Some(u) = n.as_u64() {
                    visitor.visit_u64(u)
                } else if let Some(i) = n.as_i64() {
                    visitor.visit_i64(i)
                } else {
                    visitor.visit_f64(n.as_f64().unwrap_or(f64::NAN))
                }
            }
            other => Err(wrong_kind(other, &visitor)),
        }
    }

    fn deserialize_u64<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        self.deserialize_f64(visitor)
    }

    fn deserialize_u32<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        self.deserialize_f64(visitor)
    }

    fn deserialize_str<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        match self.0 {
            Value::String(s) => visitor.visit_borrowed_str(s),
            other => Err(wrong_kind(other, &visitor)),
        }
    }

    fn deserialize_string<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        self.deserialize_str(visitor)
    }

    fn deserialize_identifier<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        self.deserialize_str(visitor)
    }

    fn deserialize_unit<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        match self.0 {
            Value::Null => visitor.visit_unit(),
            other => Err(wrong_kind(other, &visitor)),
        }
    }

    fn deserialize_seq<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        match self.0 {
            Value::Array(items) => visitor.visit_seq(Items {
                iter: items.iter(),
                index: 0,
            }),
            other => Err(wrong_kind(other, &visitor)),
        }
    }

    fn deserialize_map<V: Visitor<'de>>(self, visitor: V) -> Result<V::Value, PathError> {
        match self.0 {
            Value::Object(map) => visitor.visit_map(Entries::new(map)),
            other => Err(wrong_kind(other, &visitor)),
        }
    }

    fn deserialize_struct<V: Visitor<'de>>(
        self,
        _name: &'static str,
        _fields: &'static [&'static str],
        visitor: V,
    ) -> Result<V::Value, PathError> {
        self.deserialize_map(visitor)
    }

    forward_to_deserialize_any! {
        i8 i16 i32 i64 i128 u8 u16 u128 f32 char
        bytes byte_buf unit_struct tuple tuple_struct ignored_any
    }
}

/// serde's message for a value of the wrong kind ("invalid type: string
/// \"x\", expected f64").
fn wrong_kind<'de, V: Visitor<'de>>(v: &Value, visitor: &V) -> PathError {
    de::Error::invalid_type(unexpected(v), visitor)
}

fn unexpected(v: &Value) -> de::Unexpected<'_> {
    match v {
        Value::Null => de::Unexpected::Unit,
        Value::Bool(b) => de::Unexpected::Bool(*b),
        Value::Number(n) => match (n.as_u64(), n.as_i64()) {
            (Some(u), _) => de::Unexpected::Unsigned(u),
            (_, Some(i)) => de::Unexpected::Signed(i),
            _ => de::Unexpected::Float(n.as_f64().unwrap_or(f64::NAN)),
        },
        Value::String(s) => de::Unexpected::Str(s),
        Value::Array(_) => de::Unexpected::Seq,
        Value::Object(_) => de::Unexpected::Map,
    }
}

/// The elements of an array, each error marked with its index.
struct Items<'a> {
    iter: std::slice::Iter<'a, Value>,
    index: usize,
}

impl<'de> SeqAccess<'de> for Items<'de> {
    type Error = PathError;

    fn next_element_seed<T: DeserializeSeed<'de>>(
        &mut self,
        seed: T,
    ) -> Result<Option<T::Value>, PathError> {
        let Some(v) = self.iter.next() else {
            return Ok(None);
        };
        let i = self.index;
        self.index += 1;
        seed.deserialize(At(v))
            .map(Some)
            .map_err(|e| e.within(Segment::Index(i)))
    }

    fn size_hint(&self) -> Option<usize> {
        Some(self.iter.len())
    }
}

/// The entries of an object, each error marked with its key.
struct Entries<'a> {
    iter: serde_json::map::Iter<'a>,
    current: Option<(&'a String, &'a Value)>,
}

impl<'a> Entries<'a> {
    fn new(map: &'a Map<String, Value>) -> Self {
        Entries {
            iter: map.iter(),
            current: None,
        }
    }
}

impl<'de> MapAccess<'de> for Entries<'de> {
    type Error = PathError;

    fn next_key_seed<K: DeserializeSeed<'de>>(
        &mut self,
        seed: K,
    ) -> Result<Option<K::Value>, PathError> {
        let Some((k, v)) = self.iter.next() else {
            return Ok(None);
        };
        self.current = Some((k, v));
        let key = de::value::BorrowedStrDeserializer::<PathError>::new(k.as_str());
        seed.deserialize(key)
            .map(Some)
            .map_err(|e| e.within(Segment::Key(k.clone())))
    }

    fn next_value_seed<V: DeserializeSeed<'de>>(&mut self, seed: V) -> Result<V::Value, PathError> {
        match self.current.take() {
            Some((k, v)) => seed
                .deserialize(At(v))
                .map_err(|e| e.within(Segment::Key(k.clone()))),
            None => Err(de::Error::custom("a value without its key")),
        }
    }

    fn size_hint(&self) -> Option<usize> {
        Some(self.iter.len())
    }
}

/// An enum's variant: a name alone (`"davies"`) or a one-key object.
struct Variant<'a> {
    name: &'a str,
    content: Option<&'a Value>,
}

impl<'de> EnumAccess<'de> for Variant<'de> {
    type Error = PathError;
    type Variant = Self;

    fn variant_seed<V: DeserializeSeed<'de>>(self, seed: V) -> Result<(V::Value, Self), PathError> {
        let name = de::value::BorrowedStrDeserializer::<PathError>::new(self.name);
        Ok((seed.deserialize(name)?, self))
    }
}

impl<'de> VariantAccess<'de> for Variant<'de> {
    type Error = PathError;

    fn unit_variant(self) -> Result<(), PathError> {
        match self.content {
            None | Some(Value::Null) => Ok(()),
            Some(other) => Err(de::Error::invalid_type(unexpected(other), &"unit variant")),
        }
    }

    fn newtype_variant_seed<T: DeserializeSeed<'de>>(self, seed: T) -> Result<T::Value, PathError> {
        match self.content {
            Some(v) => seed.deserialize(At(v)),
            None => Err(de::Error::invalid_type(
                de::Unexpected::UnitVariant,
                &"newtype variant",
            )),
        }
    }

    fn tuple_variant<V: Visitor<'de>>(
        self,
        _len: usize,
        visitor: V,
    ) -> Result<V::Value, PathError> {
        match self.content {
            Some(v @ Value::Array(_)) => de::Deserializer::deserialize_any(At(v), visitor),
            _ => Err(de::Error::invalid_type(
                de::Unexpected::UnitVariant,
                &"tuple variant",
            )),
        }
    }

    fn struct_variant<V: Visitor<'de>>(
        self,
        _fields: &'static [&'static str],
        visitor: V,
    ) -> Result<V::Value, PathError> {
        match self.content {
            Some(v @ Value::Object(_)) => de::Deserializer::deserialize_any(At(v), visitor),
            _ => Err(de::Error::invalid_type(
                de::Unexpected::UnitVariant,
                &"struct variant",
            )),
        }
    }
}

/// A serde error as a field-named [`SolverError::Document`]: an unknown key
/// joins the path (`recipe.prepare_temprature_c: unknown field ...`), and a
/// quoted bad value is cut short.
pub(crate) fn serde_err(path: &str, msg: &str) -> SolverError {
    if let Some((key, expected)) = msg
        .strip_prefix("unknown field `")
        .and_then(|rest| rest.split_once('`'))
    {
        // The path may already end with the key (plain structs) or stop at
        // the enclosing object (internally tagged enums).
        let parent = path
            .strip_suffix(key)
            .map(|p| p.trim_end_matches('.'))
            .unwrap_or(path);
        let key = clip(key, QUOTE_MAX);
        let field = if parent.is_empty() || parent == "." {
            key
        } else {
            format!("{parent}.{key}")
        };
        let expected = expected.trim_start_matches([',', ' ']);
        let reason = if expected.is_empty() {
            "unknown field (check the spelling)".to_string()
        } else {
            format!("unknown field ({expected}; check the spelling)")
        };
        return SolverError::Document { field, reason };
    }
    SolverError::Document {
        field: path.into(),
        reason: shorten_quoted(msg),
    }
}

/// A key of an internally tagged object (one with a `kind`) that the parsed
/// design does not carry. Serde's `deny_unknown_fields` does not reach the
/// unit variants of such enums (`{"kind": "zero", "us_cm": 3}` would pass),
/// so the document is compared with the design read from it.
pub(crate) fn extra_tagged_key(
    input: &serde_json::Value,
    parsed: &serde_json::Value,
    path: &str,
) -> Option<String> {
    use serde_json::Value;
    let join = |key: &str| {
        if path.is_empty() {
            clip(key, QUOTE_MAX)
        } else {
            format!("{path}.{}", clip(key, QUOTE_MAX))
        }
    };
    match (input, parsed) {
        (Value::Object(a), Value::Object(b)) => {
            if a.contains_key("kind") {
                if let Some(k) = a.keys().find(|k| !b.contains_key(k.as_str())) {
                    return Some(join(k));
                }
            }
            a.iter()
                .find_map(|(k, va)| b.get(k).and_then(|vb| extra_tagged_key(va, vb, &join(k))))
        }
        (Value::Array(a), Value::Array(b)) => a
            .iter()
            .zip(b)
            .enumerate()
            .find_map(|(i, (va, vb))| extra_tagged_key(va, vb, &format!("{path}[{i}]"))),
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde::Deserialize;
    use serde_json::json;

    #[derive(Debug, Deserialize, PartialEq)]
    #[serde(deny_unknown_fields)]
    struct Inner {
        x: f64,
        #[serde(default)]
        tag: Option<Mode>,
    }

    #[derive(Debug, Deserialize, PartialEq)]
    #[serde(rename_all = "snake_case")]
    enum Mode {
        Fast,
        Slow,
    }

    #[derive(Debug, Deserialize, PartialEq)]
    #[serde(deny_unknown_fields)]
    struct Outer {
        name: String,
        items: Vec<Inner>,
        count: u32,
    }

    #[test]
    fn a_good_document_reads_as_serde_json_reads_it() {
        let v = json!({"name": "a", "items": [{"x": 1}, {"x": 2.5, "tag": "slow"}], "count": 3});
        let ours: Outer = from_value(&v).unwrap();
        assert_eq!(ours.items[1].tag, Some(Mode::Slow));
        assert_eq!(ours.items[0].x, 1.0);
        assert_eq!(ours.name, "a");
        assert_eq!(ours.count, 3);
    }

    #[test]
    fn errors_name_their_path() {
        let v = json!({"name": "a", "items": [{"x": 1}, {"x": "two"}], "count": 3});
        let e = from_value::<Outer>(&v).unwrap_err();
        assert_eq!(e.path(), "items[1].x");
        assert!(e.message.starts_with("invalid type: string \"two\""), "{e}");
        let v = json!({"name": "a", "items": [{"x": 1, "y": 2}], "count": 3});
        let e = from_value::<Outer>(&v).unwrap_err();
        assert_eq!(e.path(), "items[0].y");
        assert!(e.message.starts_with("unknown field `y`"), "{e}");
        let v = json!({"name": "a", "items": [{"x": 1, "tag": "medium"}], "count": 3});
        let e = from_value::<Outer>(&v).unwrap_err();
        assert_eq!(e.path(), "items[0].tag");
        assert!(e.message.contains("unknown variant `medium`"), "{e}");
        let v = json!({"name": "a", "items": [], "count": 1.5});
        assert_eq!(from_value::<Outer>(&v).unwrap_err().path(), "count");
        let v = json!({"items": []});
        let e = from_value::<Outer>(&v).unwrap_err();
        assert_eq!(e.path(), ".");
        assert!(e.message.contains("missing field `name`"), "{e}");
        let e = from_value::<Outer>(&json!("text")).unwrap_err();
        assert_eq!(e.path(), ".");
        // A struct is read from an object only; numbers keep their kind in messages.
        let e = from_value::<Outer>(&json!({"name": "a", "items": [[1]], "count": 1})).unwrap_err();
        assert_eq!(e.path(), "items[0]");
        assert!(e.message.contains("expected struct Inner"), "{e}");
        let e = from_value::<Outer>(&json!({"name": 7, "items": [], "count": 1})).unwrap_err();
        assert_eq!(e.path(), "name");
        assert!(e.message.starts_with("invalid type: integer `7`"), "{e}");
    }
}
