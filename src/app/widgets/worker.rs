//! Work off the page's main thread: a module worker made from a blob loads the page's own
//! WebAssembly module once and, for each message, calls the entry point the message names
//! (a `#[wasm_bindgen]` function `fn(job: &str, text: &str, progress: &Function) -> String`),
//! posting progress and the answer back. The gap search, the film thickness search and the
//! reading of long data files use it, so the page keeps drawing while they run.
//!
//! Architecture invariant: one worker script and one message format for every kind of
//! background job; what a job computes is the view's or the physics' own code.

use serde::Deserialize;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

/// The worker's script: load the module once, then call `msg.call(msg.job, msg.text, progress)`.
const WORKER_SCRIPT: &str = r#"'use strict';
// Glowgap's background jobs: load the app's module once, then run one entry point per message.
let ready = null;
self.onmessage = async (e) => {
  const msg = e.data;
  try {
    if (!ready) ready = import(msg.module).then(async (m) => { await m.default({ module_or_path: msg.wasm }); return m; });
    const m = await ready;
    const run = m[msg.call];
    if (typeof run !== 'function') throw new Error('no job called ' + msg.call);
    // a file is read here, off the page's thread
    const text = msg.file ? await msg.file.text() : (msg.text || '');
    const reply = run(msg.job, text, (n) => self.postMessage(JSON.stringify({ id: msg.id, progress: n })));
    self.postMessage(JSON.stringify({ id: msg.id, reply }));
  } catch (err) {
    self.postMessage(JSON.stringify({ id: msg.id, failed: String((err && err.message) || err) }));
  }
};
"#;

/// What a worker posts back: progress, the entry point's answer, or why it failed.
#[derive(Debug, Deserialize)]
pub struct WorkerReply {
    pub id: u64,
    pub progress: Option<f64>,
    pub reply: Option<String>,
    pub failed: Option<String>,
}

/// A running worker with its handlers (kept alive as long as the worker).
pub struct Background {
    worker: web_sys::Worker,
    module: String,
    wasm: String,
    _on_message: Closure<dyn FnMut(web_sys::MessageEvent)>,
    _on_error: Closure<dyn FnMut(web_sys::Event)>,
}

/// The absolute URLs of the app's JavaScript module and of its WebAssembly (the ones the
/// page itself loads; the build gives them hashed names).
fn module_urls() -> Option<(String, String)> {
    let window = web_sys::window()?;
    let doc = window.document()?;
    let base = window.location().href().ok()?;
    let attr = |sel: &str| doc.query_selector(sel).ok().flatten().and_then(|l| l.get_attribute("href"));
    let js = attr("link[rel=\"modulepreload\"][href$=\".js\"]").or_else(|| {
        // the page's loader script: import init, * as bindings from './glowgap-….js'
        let script = doc.query_selector("script[type=\"module\"]").ok().flatten()?.inner_html();
        let start = script.find("from '")? + 6;
        let end = script[start..].find('\'')? + start;
        Some(script[start..end].to_string())
    })?;
    let wasm = attr("link[rel=\"preload\"][href$=\".wasm\"]")
        .unwrap_or_else(|| js.trim_end_matches(".js").to_string() + "_bg.wasm");
    let abs = |u: &str| web_sys::Url::new_with_base(u, &base).ok().map(|u| u.href());
    Some((abs(&js)?, abs(&wasm)?))
}

impl Background {
    /// Start a worker; `on_reply` gets every message it posts, `on_error` why it failed.
    pub fn start(
        mut on_reply: impl FnMut(WorkerReply) + 'static,
        mut on_error: impl FnMut(String) + 'static,
    ) -> Result<Background, String> {
        let (module, wasm) = module_urls().ok_or("the page could not find its own module to run in the background")?;
        let parts = js_sys::Array::of1(&JsValue::from_str(WORKER_SCRIPT));
        let opts = web_sys::BlobPropertyBag::new();
        opts.set_type("text/javascript");
        let blob = web_sys::Blob::new_with_str_sequence_and_options(&parts, &opts)
            .map_err(|_| "the browser could not make the worker's script")?;
        let url = web_sys::Url::create_object_url_with_blob(&blob)
            .map_err(|_| "the browser could not make the worker's script")?;
        let wo = web_sys::WorkerOptions::new();
        wo.set_type(web_sys::WorkerType::Module);
        let worker = web_sys::Worker::new_with_options(&url, &wo)
            .map_err(|_| "this browser cannot start a background worker")?;
        let _ = web_sys::Url::revoke_object_url(&url);
        let on_message = Closure::<dyn FnMut(web_sys::MessageEvent)>::new(move |e: web_sys::MessageEvent| {
            if let Some(text) = e.data().as_string() {
                if let Ok(m) = serde_json::from_str::<WorkerReply>(&text) {
                    on_reply(m);
                }
            }
        });
        let on_err = Closure::<dyn FnMut(web_sys::Event)>::new(move |e: web_sys::Event| {
            e.prevent_default();
            let msg = js_sys::Reflect::get(&e, &JsValue::from_str("message"))
                .ok()
                .and_then(|m| m.as_string())
                .unwrap_or_default();
            on_error(msg);
        });
        worker.set_onmessage(Some(on_message.as_ref().unchecked_ref()));
        worker.set_onerror(Some(on_err.as_ref().unchecked_ref()));
        Ok(Background { worker, module, wasm, _on_message: on_message, _on_error: on_err })
    }

    /// The message asking for entry point `call` on `job`; None if it could not be made.
    fn message(&self, id: u64, call: &str, job: &str) -> Option<js_sys::Object> {
        let msg = js_sys::Object::new();
        let set = |k: &str, v: JsValue| js_sys::Reflect::set(&msg, &JsValue::from_str(k), &v).is_ok();
        let ok = set("id", JsValue::from_f64(id as f64))
            && set("module", JsValue::from_str(&self.module))
            && set("wasm", JsValue::from_str(&self.wasm))
            && set("call", JsValue::from_str(call))
            && set("job", JsValue::from_str(job));
        ok.then_some(msg)
    }

    /// Hand `msg` over with one more field `key`; returns whether it was handed over.
    fn send(&self, msg: Option<js_sys::Object>, key: &str, value: JsValue) -> bool {
        msg.is_some_and(|m| {
            js_sys::Reflect::set(&m, &JsValue::from_str(key), &value).is_ok() && self.worker.post_message(&m).is_ok()
        })
    }

    /// Ask the worker to run entry point `call` on `job` (and `text`, e.g. a file's
    /// contents, passed as it is rather than inside `job`). Returns whether it was handed over.
    pub fn post(&self, id: u64, call: &str, job: &str, text: &str) -> bool {
        self.send(self.message(id, call, job), "text", JsValue::from_str(text))
    }

    /// Ask the worker to run entry point `call` on `job` and the text of `file`, which the
    /// worker reads itself (the page's thread never holds the file's text).
    pub fn post_file(&self, id: u64, call: &str, job: &str, file: &web_sys::File) -> bool {
        self.send(self.message(id, call, job), "file", file.into())
    }

    /// End the worker at once (a cancelled or replaced job).
    pub fn stop(&self) {
        self.worker.terminate();
    }
}
