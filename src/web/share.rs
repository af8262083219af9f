//! Browser helpers for handing results over: downloads (text, SVG, PNG), the clipboard and
//! the address bar. Nothing here leaves the machine.

use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

fn document() -> Option<web_sys::Document> {
    web_sys::window()?.document()
}

fn click_download(url: &str, filename: &str) -> Result<(), String> {
    let doc = document().ok_or("no document")?;
    let a: web_sys::HtmlAnchorElement = doc
        .create_element("a")
        .map_err(|_| "could not create a link")?
        .unchecked_into();
    a.set_href(url);
    a.set_download(filename);
    a.style().set_property("display", "none").ok();
    let body = doc.body().ok_or("no body")?;
    body.append_child(&a).ok();
    a.click();
    body.remove_child(&a).ok();
    Ok(())
}

fn blob_url(content: &str, mime: &str) -> Result<String, String> {
    let parts = js_sys::Array::new();
    parts.push(&JsValue::from_str(content));
    let opts = web_sys::BlobPropertyBag::new();
    opts.set_type(mime);
    let blob = web_sys::Blob::new_with_str_sequence_and_options(&parts, &opts)
        .map_err(|_| "could not build the file")?;
    web_sys::Url::create_object_url_with_blob(&blob).map_err(|_| "could not build the file".into())
}

/// Offers `content` as a file download.
pub fn download(filename: &str, mime: &str, content: &str) -> Result<(), String> {
    let url = blob_url(content, mime)?;
    let r = click_download(&url, filename);
    let _ = web_sys::Url::revoke_object_url(&url);
    r
}

/// Renders an SVG to a PNG (twice its size, on white) and offers it as a download.
pub fn download_png(filename: &str, svg: &str, width: u32, height: u32) -> Result<(), String> {
    let url = blob_url(svg, "image/svg+xml")?;
    let img = web_sys::HtmlImageElement::new().map_err(|_| "could not create an image")?;
    let name = filename.to_string();
    let img2 = img.clone();
    let url2 = url.clone();
    let onload = Closure::once(move || {
        let Some(doc) = document() else { return };
        let Ok(el) = doc.create_element("canvas") else {
            return;
        };
        let canvas: web_sys::HtmlCanvasElement = el.unchecked_into();
        canvas.set_width(width * 2);
        canvas.set_height(height * 2);
        if let Ok(Some(ctx)) = canvas.get_context("2d") {
            let ctx: web_sys::CanvasRenderingContext2d = ctx.unchecked_into();
            ctx.set_fill_style_str("white");
            ctx.fill_rect(0.0, 0.0, (width * 2) as f64, (height * 2) as f64);
            let _ = ctx.draw_image_with_html_image_element_and_dw_and_dh(
                &img2,
                0.0,
                0.0,
                (width * 2) as f64,
                (height * 2) as f64,
            );
            if let Ok(data) = canvas.to_data_url_with_type("image/png") {
                let _ = click_download(&data, &name);
            }
        }
        let _ = web_sys::Url::revoke_object_url(&url2);
    });
    img.set_onload(Some(onload.as_ref().unchecked_ref()));
    onload.forget();
    img.set_src(&url);
    Ok(())
}

/// Puts text on the clipboard; returns false when the browser refuses (then the page shows
/// the text to copy by hand).
pub fn copy(text: &str) -> bool {
    let Some(w) = web_sys::window() else {
        return false;
    };
    let clip = w.navigator().clipboard();
    let _ = clip.write_text(text);
    true
}

/// The page's address without its fragment.
pub fn base_url() -> String {
    web_sys::window()
        .and_then(|w| w.location().href().ok())
        .map(|h| h.split('#').next().unwrap_or("").to_string())
        .unwrap_or_default()
}

/// The current fragment, without '#'.
pub fn fragment() -> String {
    web_sys::window()
        .and_then(|w| w.location().hash().ok())
        .map(|h| h.trim_start_matches('#').to_string())
        .unwrap_or_default()
}

/// Replaces the fragment without adding a history entry.
pub fn set_fragment(frag: &str) {
    if let Some(w) = web_sys::window() {
        if let Ok(h) = w.history() {
            let url = if frag.is_empty() {
                base_url()
            } else {
                format!("{}#{frag}", base_url())
            };
            let _ = h.replace_state_with_url(&JsValue::NULL, "", Some(&url));
        }
    }
}

/// Today's date in the browser, YYYY-MM-DD.
pub fn today() -> String {
    let s: String = js_sys::Date::new_0().to_iso_string().into();
    s.chars().take(10).collect()
}
