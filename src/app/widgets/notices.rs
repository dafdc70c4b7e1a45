//! Messages every panel shows: the notices across the top of the page (a link that could
//! not be opened, the saved work a link replaced), and the cautions and colophon at the foot.

use leptos::prelude::*;

use crate::app::share::apply_scenario;
use crate::app::state::{Ctx, NoticeAction};

pub fn notices(ctx: Ctx) -> impl IntoView {
    move || {
        let list = ctx.notices.get();
        if list.is_empty() {
            return None;
        }
        Some(view! {
            <div class="notices">
                {list
                    .into_iter()
                    .map(|n| {
                        let kind = n.kind;
                        let role = if n.alert { "alert" } else { "status" };
                        let action = n.action.map(|a| match a {
                            NoticeAction::Restore(s, label) => {
                                let s = *s;
                                view! {
                                    <button type="button" class="small" data-action=format!("{}-restore", kind.as_str()) on:click=move |_| {
                                        apply_scenario(ctx, s.clone());
                                        ctx.dismiss(kind);
                                    }>{label}</button>
                                }
                                .into_any()
                            }
                            NoticeAction::UseSpectrum(t, label) => {
                                let t = *t;
                                view! {
                                    <button type="button" class="small" data-action=format!("{}-use", kind.as_str()) on:click=move |_| {
                                        crate::app::import::use_table(ctx, t.clone());
                                        ctx.dismiss(kind);
                                    }>{label}</button>
                                }
                                .into_any()
                            }
                        });
                        view! {
                            <div class="notice" class:alert=n.alert role=role data-notice=kind.as_str()>
                                <p>{n.text}</p>
                                <div class="notice-actions">
                                    {action}
                                    <button type="button" class="small ghost" aria-label="Dismiss this notice" on:click=move |_| ctx.dismiss(kind)>"Dismiss"</button>
                                </div>
                            </div>
                        }
                    })
                    .collect_view()}
            </div>
        })
    }
}

/// A panel's cautions, each (lead-in, text), and the colophon.
pub fn caution_footer(items: &[(&'static str, &'static str)]) -> impl IntoView {
    let items = items.iter().map(|(lead, text)| view! { <p><strong>{*lead}</strong>{*text}</p> }).collect_view();
    view! {
        <footer class="cautions">
            {items}
            {colophon()}
        </footer>
    }
}

/// The closing line of every panel's cautions.
pub fn colophon() -> impl IntoView {
    view! { <p class="colophon">"Glowgap computes everything in this browser; nothing is sent anywhere. It keeps working offline after the first visit."</p> }
}
