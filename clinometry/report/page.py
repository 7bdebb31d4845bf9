"""The review page of a batch run: one self-contained static ``index.html``.

The page needs no server and no network: CSS and the small sorting/filtering
script are inline, and images and JSON files are linked by relative paths in
the same output folder, so the folder can be copied or zipped as a whole.
It shows the usual cautions first, then the margins table (click a header to
sort, filter by family and minimum confidence; a link can preset both, e.g.
``index.html#family=ramp&conf=0.5&sort=slope_max_deg``), a thumbnail per line linking
to its QC figure and result JSON, the summary and map figures, and the
errors.  Every piece of text taken from input files or results is escaped
with :func:`html.escape`.
"""

from __future__ import annotations

import html
import logging
from urllib.parse import quote

from .atomic import atomic_write

__all__ = ["CAUTION_TEXT", "TABLE_COLUMNS", "index_html", "write_index"]

logger = logging.getLogger(__name__)

#: cautions shown at the top of the page (common practice, no source)
CAUTION_TEXT = (
    "Automatic picks and margin classes support, and do not replace, the judgement of a qualified "
    "interpreter: check every line against its QC figure. Depths, slopes and reliefs carry the "
    "uncertainty of the velocity model and of the picking, and are no substitute for well control. "
    "Decisions on drilling, injection, storage or any other work that can harm people or the "
    "environment must follow local regulations and licensed professional practice."
)

#: (key in a margins row, column heading, number of decimals or None for text)
TABLE_COLUMNS = (
    ("stem", "line", None),
    ("direction", "basin side", None),
    ("family", "family", None),
    ("subtype", "subtype", None),
    ("confidence", "confidence", 2),
    ("slope_max_deg", "max slope (°)", 1),
    ("slope_mean_deg", "mean slope (°)", 1),
    ("relief_m", "relief (m)", 0),
    ("break_depth_m", "break depth (m)", 0),
    ("toe_depth_m", "toe depth (m)", 0),
    ("break_x", "break x (m)", 0),
    ("break_y", "break y (m)", 0),
    ("trajectory_class", "trajectory", None),
    ("trajectory_angle_deg", "trajectory (°)", 1),
)

_CSS = """
body{font-family:system-ui,-apple-system,"Segoe UI",sans-serif;margin:1.2em 2em;color:#111;max-width:1400px}
h1{font-size:1.5em;margin-bottom:.2em}h2{font-size:1.2em;margin-top:1.6em;border-bottom:1px solid #ccc}
.caution{background:#fff4e0;border-left:6px solid #E69F00;padding:.6em 1em;margin:1em 0}
table{border-collapse:collapse;font-size:.86em}th,td{border:1px solid #ccc;padding:.25em .5em;text-align:right}
th{background:#eef3f8;cursor:pointer;user-select:none;position:sticky;top:0;text-align:left}
td.t{text-align:left;white-space:nowrap}
th.asc::after{content:" \\25B2"}th.desc::after{content:" \\25BC"}
tr:nth-child(even){background:#f8f8f8}.fam{display:inline-block;width:.8em;height:.8em;margin-right:.3em;border:1px solid #333}
.controls{margin:.6em 0}.controls label{margin-right:1.2em}
.thumbs{display:flex;flex-wrap:wrap;gap:12px}.thumb{width:230px;font-size:.8em;border:1px solid #ddd;padding:4px}
.thumb img{width:100%;height:auto;border:1px solid #eee}.failed{color:#D55E00}
.figs img{max-width:100%;border:1px solid #ddd;margin-bottom:1em}.muted{color:#555}
"""

_JS = r"""
(function(){
  var table=document.getElementById('margins'); if(!table) return;
  var tbody=table.tBodies[0];
  var heads=table.tHead.rows[0].cells;
  function val(td,num){var v=td.getAttribute('data-v'); if(num){var f=parseFloat(v); return isNaN(f)?null:f;} return v||'';}
  for(var i=0;i<heads.length;i++){(function(i){
    heads[i].addEventListener('click',function(){
      var num=heads[i].getAttribute('data-num')==='1';
      var asc=!heads[i].classList.contains('asc');
      for(var k=0;k<heads.length;k++){heads[k].classList.remove('asc','desc');}
      heads[i].classList.add(asc?'asc':'desc');
      var rows=Array.prototype.slice.call(tbody.rows);
      rows.sort(function(a,b){var x=val(a.cells[i],num),y=val(b.cells[i],num);
        if(x===null&&y===null) return 0; if(x===null) return 1; if(y===null) return -1;
        var c=num?(x-y):String(x).localeCompare(String(y)); return asc?c:-c;});
      rows.forEach(function(r){tbody.appendChild(r);});
    });})(i);}
  var fam=document.getElementById('f-family'), conf=document.getElementById('f-conf'), shown=document.getElementById('n-shown');
  function filter(){var f=fam.value, c=parseFloat(conf.value)||0, n=0;
    Array.prototype.forEach.call(tbody.rows,function(r){
      var ok=(f===''||r.getAttribute('data-family')===f)&&(parseFloat(r.getAttribute('data-confidence'))||0)>=c;
      r.style.display=ok?'':'none'; if(ok) n++;});
    shown.textContent=n;}
  fam.addEventListener('change',filter); conf.addEventListener('input',filter);
  // a link may preset the view: index.html#family=ramp&conf=0.5&sort=slope_max_deg
  location.hash.replace(/^#/,'').split('&').forEach(function(kv){
    var p=kv.split('='), v=decodeURIComponent(p[1]||'');
    if(p[0]==='family') fam.value=v;
    if(p[0]==='conf') conf.value=v;
    if(p[0]==='sort'){for(var k=0;k<heads.length;k++){if(heads[k].getAttribute('data-key')===v) heads[k].click();}}
  });
  filter();
})();
"""

_FAMILY_SWATCH = {"ramp": "#009E73", "rimmed_shelf": "#0072B2", "steep_margin": "#D55E00"}


def _e(v) -> str:
    return html.escape("" if v is None else str(v), quote=True)


def _href(name) -> str:
    return _e(quote(str(name)))


def _cell(row, key, digits):
    v = row.get(key)
    if digits is None:
        text = "" if v is None else str(v)
        if key == "family":
            sw = _FAMILY_SWATCH.get(text, "#7f7f7f")
            return (f'<td class="t" data-v="{_e(text)}"><span class="fam" style="background:{sw}"></span>'
                    f"{_e(text or 'unclassified')}</td>")
        if key == "direction":
            words = {"+": "towards higher traces", "-": "towards lower traces"}.get(text, text)
            return f'<td class="t" data-v="{_e(text)}" title="basin side along the line">{_e(words)}</td>'
        if key == "stem" and row.get("json"):
            return f'<td class="t" data-v="{_e(text)}"><a href="{_href(row["json"])}">{_e(text)}</a></td>'
        return f'<td class="t" data-v="{_e(text)}">{_e(text)}</td>'
    try:
        num = float(v)
    except (TypeError, ValueError):
        return '<td data-v="">–</td>'
    return f'<td data-v="{num!r}">{num:.{digits}f}</td>'


def index_html(*, margins, lines, errors, summary_png=None, map_png=None, title="clinometry batch review",
               cautions=None) -> str:
    """Build the review page as a string.

    Parameters
    ----------
    margins : list of dict
        Rows of the margins table (:func:`clinometry.report.tables.margin_rows`),
        optionally with ``json`` (relative link to the line's result).
    lines : list of dict
        One per line: ``stem``, ``file``, ``line``, ``status`` (``"ok"`` or
        ``"failed"``), ``png`` and ``json`` (relative names or None),
        ``n_margins``.
    errors : list of dict
        Rows of the errors table (``file, line, error_type, message``).
    summary_png, map_png : str, optional
        Relative names of the summary and map figures.
    title : str
    cautions : sequence of str, optional
        Extra cautions (e.g. the ones recorded in the results) shown under
        the general one.

    Returns
    -------
    str
        A complete HTML5 document with inline CSS and JS and only relative
        links.
    """
    out = ["<!DOCTYPE html>", '<html lang="en"><head><meta charset="utf-8">',
           '<meta name="viewport" content="width=device-width, initial-scale=1">',
           f"<title>{_e(title)}</title><style>{_CSS}</style></head><body>",
           f"<h1>{_e(title)}</h1>"]
    n_ok = sum(1 for ln in lines if ln.get("status") == "ok")
    out.append(f'<p class="muted">{len(lines)} line(s): {n_ok} analysed, {len(errors)} failed; '
               f"{len(margins)} margin(s) found.</p>")
    out.append('<div class="caution" id="caution"><strong>Caution.</strong> ' + _e(CAUTION_TEXT))
    extra = [c for c in (cautions or []) if c]
    if extra:
        out.append("<ul>" + "".join(f"<li>{_e(c)}</li>" for c in extra) + "</ul>")
    out.append("</div>")

    families = sorted({str(r.get("family")) for r in margins if r.get("family")})
    out.append('<h2 id="margins-heading">Margins</h2><div class="controls">'
               '<label>family <select id="f-family"><option value="">all</option>'
               + "".join(f'<option value="{_e(f)}">{_e(f)}</option>' for f in families)
               + '<option value="unclassified">unclassified</option></select></label>'
               '<label>minimum confidence <input id="f-conf" type="number" min="0" max="1" step="0.05" value="0">'
               '</label><span class="muted">showing <span id="n-shown">'
               f"{len(margins)}</span> of {len(margins)}; click a heading to sort</span></div>")
    out.append('<table id="margins"><thead><tr>')
    for key, head, digits in TABLE_COLUMNS:
        out.append(f'<th data-key="{_e(key)}" data-num="{0 if digits is None else 1}">{_e(head)}</th>')
    out.append("</tr></thead><tbody>")
    for r in margins:
        fam = r.get("family") or "unclassified"
        conf = r.get("confidence")
        out.append(f'<tr data-family="{_e(fam)}" data-confidence="{_e(conf if conf is not None else 0)}">')
        out.extend(_cell(r, key, digits) for key, _, digits in TABLE_COLUMNS)
        out.append("</tr>")
    out.append("</tbody></table>")

    if summary_png or map_png:
        out.append('<h2 id="figures">Summary and map</h2><div class="figs">')
        for name, alt in ((summary_png, "slope and relief per margin family"),
                          (map_png, "shelf-break map by family and depth")):
            if name:
                out.append(f'<a href="{_href(name)}"><img src="{_href(name)}" alt="{_e(alt)}"></a>')
        out.append("</div>")

    out.append('<h2 id="lines">Lines</h2><div class="thumbs">')
    for ln in lines:
        label = " ".join(str(s) for s in (ln.get("file"), ln.get("line")) if s)
        out.append('<div class="thumb">')
        if ln.get("png"):
            out.append(f'<a href="{_href(ln["png"])}"><img src="{_href(ln["png"])}" alt="QC figure of {_e(label)}" '
                       'loading="lazy"></a>')
        status = ln.get("status")
        cls = ' class="failed"' if status != "ok" else ""
        out.append(f"<div{cls}><strong>{_e(ln.get('stem'))}</strong><br>{_e(label)}<br>")
        if status == "ok":
            out.append(f"{_e(ln.get('n_margins', 0))} margin(s)")
        else:
            out.append("failed (see errors)")
        links = []
        if ln.get("json"):
            links.append(f'<a href="{_href(ln["json"])}">JSON</a>')
        if ln.get("png"):
            links.append(f'<a href="{_href(ln["png"])}">QC figure</a>')
        if ln.get("csv"):
            links.append(f'<a href="{_href(ln["csv"])}">horizons CSV</a>')
        if links:
            out.append("<br>" + " · ".join(links))
        out.append("</div></div>")
    out.append("</div>")

    out.append('<h2 id="errors">Errors</h2>')
    if errors:
        out.append('<table id="errors-table"><thead><tr><th>file</th><th>line</th><th>error</th><th>message</th>'
                   "</tr></thead><tbody>")
        for r in errors:
            out.append("<tr>" + "".join(f'<td class="t">{_e(r.get(k))}</td>'
                                        for k in ("file", "line", "error_type", "message")) + "</tr>")
        out.append("</tbody></table>")
    else:
        out.append('<p class="muted">No line failed.</p>')
    out.append(f"<script>{_JS}</script></body></html>")
    return "\n".join(out)


def write_index(path, **kwargs):
    """Write :func:`index_html` to ``path`` atomically; returns the path."""
    return atomic_write(path, index_html(**kwargs))
