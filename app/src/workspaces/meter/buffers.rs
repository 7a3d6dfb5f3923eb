//! The user's technical buffers on the meter bench: the values printed on a bottle at two temperatures, kept in the design's calibration.

use crate::widgets::format::fmt_input;
use crate::widgets::inputs::NumberField;
use leptos::prelude::*;
use solver::meter::calibration::{buffer_ph, validate_buffers};
use solver::meter::{BottleValue, CalibrationSpec, TechnicalBuffer};

/// A change to the calibration, run by the bench inside one design update.
pub type Edit = Box<dyn Fn(&mut CalibrationSpec) + Send + Sync>;

/// An id for a buffer named `name`, not used by `taken`.
pub fn buffer_id(name: &str, taken: &[TechnicalBuffer]) -> String {
    let stem: String = name
        .to_ascii_lowercase()
        .chars()
        .map(|c| if c.is_ascii_alphanumeric() { c } else { '_' })
        .take(24)
        .collect();
    let stem = format!("my_{}", stem.trim_matches('_'));
    (1..)
        .map(|n| {
            if n == 1 {
                stem.clone()
            } else {
                format!("{stem}_{n}")
            }
        })
        .find(|id| !taken.iter().any(|b| &b.id == id))
        .unwrap_or(stem)
}

/// The list of the user's buffers and a form to add one.
#[component]
pub fn TechnicalBuffers(
    /// The calibration shown.
    cal: Memo<CalibrationSpec>,
    /// Applies a change to the design's calibration.
    edit: Callback<Edit>,
) -> impl IntoView {
    let name = RwSignal::new(String::new());
    let (t1, p1) = (RwSignal::new(10.0_f64), RwSignal::new(f64::NAN));
    let (t2, p2) = (RwSignal::new(30.0_f64), RwSignal::new(f64::NAN));
    let msg = RwSignal::new(None::<String>);
    let add = move |_| {
        let mut list = cal.with_untracked(|c| c.buffers.clone());
        let n = name.get_untracked();
        let b = TechnicalBuffer {
            id: buffer_id(&n, &list),
            name: n.trim().to_string(),
            values: vec![
                BottleValue {
                    temperature_c: t1.get_untracked(),
                    ph: p1.get_untracked(),
                },
                BottleValue {
                    temperature_c: t2.get_untracked(),
                    ph: p2.get_untracked(),
                },
            ],
            u95_ph: None,
        };
        list.push(b.clone());
        match validate_buffers(&list) {
            Err(e) => msg.set(Some(e.to_string())),
            Ok(()) if b.name.is_empty() => msg.set(Some("Give the buffer a name.".into())),
            Ok(()) => {
                msg.set(None);
                name.set(String::new());
                edit.run(Box::new(move |c| c.buffers.push(b.clone())));
            }
        }
    };
    let field = |s: RwSignal<f64>,
                 id: &'static str,
                 label: &'static str,
                 path: &'static str,
                 suffix: &'static str| {
        view! { <NumberField id=id label=label path=path suffix=suffix value=Signal::derive(move || s.get())
        on_value=Callback::new(move |v| s.set(v)) /> }
    };
    let list = move || {
        let c = cal.get();
        c.buffers
            .iter()
            .map(|b| {
                let id = b.id.clone();
                let at = buffer_ph(&b.id, c.temperature_c, &c.buffers, "b", "t").map_or_else(
                    |_| format!("no value at {} °C", fmt_input(c.temperature_c)),
                    |(p, u)| format!("pH {p:.2} ± {u} at {} °C", fmt_input(c.temperature_c)),
                );
                let bottle = b
                    .values
                    .iter()
                    .map(|v| format!("{} at {} °C", fmt_input(v.ph), fmt_input(v.temperature_c)))
                    .collect::<Vec<_>>()
                    .join(", ");
                view! {
                    <li data-testid=format!("meter-buffer-{}", b.id)>
                        {format!("{} — bottle: {bottle}; {at}", b.name)}
                        <button type="button" class="btn" on:click=move |_| {
                            let id = id.clone();
                            edit.run(Box::new(move |c| {
                                c.buffers.retain(|x| x.id != id);
                                for p in &mut c.points {
                                    if p.standard == id {
                                        p.standard = "phosphate_1_1".into();
                                    }
                                }
                            }));
                        }>"Remove"</button>
                    </li>
                }
            })
            .collect_view()
    };
    view! {
        <details class="meter-buffers">
            <summary>"Your technical buffers (values from the bottle)"</summary>
            <ul>{list}</ul>
            <div class="field">
                <label for="meter-buf-name">"Name"</label>
                <input id="meter-buf-name" type="text" autocomplete="off" maxlength="60"
                    prop:value=move || name.get() on:input=move |ev| name.set(event_target_value(&ev)) />
            </div>
            <div class="row-2">
                {field(t1, "meter-buf-t1", "Temperature", "calibration.buffers[].values[].temperature_c", "°C")}
                {field(p1, "meter-buf-ph1", "pH on the bottle", "calibration.buffers[].values[].ph", "")}
                {field(t2, "meter-buf-t2", "Temperature", "calibration.buffers[].values[].temperature_c", "°C")}
                {field(p2, "meter-buf-ph2", "pH on the bottle", "calibration.buffers[].values[].ph", "")}
            </div>
            <button type="button" class="btn" data-testid="meter-buffer-add" on:click=add>"Add this buffer"</button>
            {move || msg.get().map(|m| view! { <p class="field-msg" role="alert">{m}</p> })}
            <p class="hint">"Between the bottle's temperatures the pH is interpolated; outside them it is refused. Kept in this design."</p>
        </details>
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ids_are_slugs_and_unique() {
        let b = |id: &str| TechnicalBuffer {
            id: id.into(),
            name: String::new(),
            values: vec![],
            u95_ph: None,
        };
        assert_eq!(buffer_id("Lab pH 10!", &[]), "my_lab_ph_10");
        assert_eq!(
            buffer_id("Lab pH 10", &[b("my_lab_ph_10")]),
            "my_lab_ph_10_2"
        );
    }
}
