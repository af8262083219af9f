//! JSON numbers that may be infinite or undefined.

/// Serde for numbers that may be infinite or undefined (a t statistic of groups without
/// spread, a ratio with a zero count): JSON has no such numbers and serde_json would write
/// `null`, which cannot be read back as a number. They are written as the strings "inf",
/// "-inf" and "NaN"; finite numbers stay numbers. Use with `#[serde(with = "float")]`.
pub mod float {
    use serde::{Deserialize, Deserializer, Serializer};

    pub fn serialize<S: Serializer>(v: &f64, s: S) -> Result<S::Ok, S::Error> {
        if v.is_finite() {
            s.serialize_f64(*v)
        } else if v.is_nan() {
            s.serialize_str("NaN")
        } else if *v > 0.0 {
            s.serialize_str("inf")
        } else {
            s.serialize_str("-inf")
        }
    }

    #[derive(Deserialize)]
    #[serde(untagged)]
    enum Num {
        F(f64),
        S(String),
    }

    pub fn deserialize<'de, D: Deserializer<'de>>(d: D) -> Result<f64, D::Error> {
        match Num::deserialize(d)? {
            Num::F(v) => Ok(v),
            Num::S(s) => match s.as_str() {
                "inf" => Ok(f64::INFINITY),
                "-inf" => Ok(f64::NEG_INFINITY),
                "NaN" => Ok(f64::NAN),
                other => Err(serde::de::Error::custom(format!(
                    "\"{other}\" is not a number"
                ))),
            },
        }
    }
}

/// [`float`] for optional numbers (None stays `null`).
pub mod float_opt {
    use serde::{Deserialize, Deserializer, Serialize, Serializer};

    #[derive(Serialize, Deserialize)]
    struct W(#[serde(with = "super::float")] f64);

    pub fn serialize<S: Serializer>(v: &Option<f64>, s: S) -> Result<S::Ok, S::Error> {
        v.map(W).serialize(s)
    }

    pub fn deserialize<'de, D: Deserializer<'de>>(d: D) -> Result<Option<f64>, D::Error> {
        Ok(Option::<W>::deserialize(d)?.map(|w| w.0))
    }
}

/// [`float`] for an optional list of numbers (a run's kept statistics, which may include
/// infinite ones; None stays `null`).
pub mod float_vec_opt {
    use serde::{Deserialize, Deserializer, Serialize, Serializer};

    #[derive(Serialize, Deserialize)]
    struct W(#[serde(with = "super::float")] f64);

    pub fn serialize<S: Serializer>(v: &Option<Vec<f64>>, s: S) -> Result<S::Ok, S::Error> {
        v.as_ref()
            .map(|xs| xs.iter().map(|&x| W(x)).collect::<Vec<W>>())
            .serialize(s)
    }

    pub fn deserialize<'de, D: Deserializer<'de>>(d: D) -> Result<Option<Vec<f64>>, D::Error> {
        Ok(Option::<Vec<W>>::deserialize(d)?.map(|ws| ws.into_iter().map(|w| w.0).collect()))
    }
}
