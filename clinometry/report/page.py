"""The review page of a batch run: one self-contained static ``index.html``.

The page needs no server and no network: CSS and the small script are
inline, and images and JSON files are linked by relative paths in the same
output folder, so the folder can be copied or zipped as a whole.

What it shows, top to bottom: the caution (once); a banner when any line was
converted with the package default velocity; the review bar (reviewer name,
export and import of ``review.csv``, counts per review state); the margins
table -- click a heading to sort; filter by family, minimum confidence and
review state; a link can preset them, e.g.
``index.html#family=ramp&conf=0.5&sort=slope_max_deg&review=accepted``.
Each row has the line's name, which opens its QC figure large in the page
(the JSON is the small link beside it), P10-P90 of maximum slope, relief
and break depth, the velocity model (flagged when it was the default), the
reasons (a row that expands), and a decision (accept / reject / needs-work)
with a free-text note.  Decisions are kept in the browser (``localStorage``,
per page) and exported as ``review.csv`` (:mod:`clinometry.report.review`);
decisions a batch already carried (``--review``) come with the page, and a
decision on picks that have since moved shows as "changed since review".
Below: the summary and map figures, one thumbnail per line (following the
table's filter), and the errors.  Every piece of text taken from input files
or results is escaped with :func:`html.escape`.
"""

from __future__ import annotations

import html
import logging
import os
from urllib.parse import quote

from ._text import DEFAULT_VELOCITY_FLAG, user_text
from .atomic import atomic_write
from .review import REVIEW_COLUMNS

__all__ = ["CAUTION_TEXT", "TABLE_COLUMNS", "index_html", "write_index", "margin_details"]

logger = logging.getLogger(__name__)

#: the caution shown once, at the top of the page (common practice, no source)
CAUTION_TEXT = (
    "Automatic picks and margin classes support, and do not replace, the judgement of a qualified "
    "interpreter: check every line against its QC figure. Depths, slopes and reliefs carry the "
    "uncertainty of the velocity model and of the picking, and are no substitute for well control. "
    "Decisions on drilling, injection, storage or any other work that can harm people or the "
    "environment must follow local regulations and licensed professional practice."
)

#: (key in a margins row, column heading, kind): kind is the number of decimals, None for text,
#: "p10-p90" for the range of ``key_p10`` to ``key_p90``, or one of "reasons", "decision", "note", "state"
TABLE_COLUMNS = (
    ("stem", "line (opens the QC figure)", None),
    ("decision", "decision", "decision"),
    ("note", "note", "note"),
    ("review_status", "review state", "state"),
    ("direction", "basin side", None),
    ("family", "family", None),
    ("subtype", "subtype", None),
    ("confidence", "confidence", 2),
    ("slope_max_deg", "max slope (°)", 1),
    ("slope_max_deg", "max slope P10-P90 (°)", "p10-p90"),
    ("slope_mean_deg", "mean slope (°)", 1),
    ("relief_m", "relief (m)", 0),
    ("relief_m", "relief P10-P90 (m)", "p10-p90"),
    ("break_depth_m", "break depth (m)", 0),
    ("break_depth_m", "break depth P10-P90 (m)", "p10-p90"),
    ("toe_depth_m", "toe depth (m)", 0),
    ("trajectory_class", "trajectory", None),
    ("trajectory_angle_deg", "trajectory (°)", 1),
    ("velocity_model", "velocity", None),
    ("reasons", "reasons (click to expand)", "reasons"),
    ("break_x", "break x (m)", 0),
    ("break_y", "break y (m)", 0),
)

_CSS = """
body{font-family:system-ui,-apple-system,"Segoe UI",sans-serif;margin:1.2em 2em;color:#111}
h1{font-size:1.5em;margin-bottom:.2em}h2{font-size:1.2em;margin-top:1.6em;border-bottom:1px solid #ccc}
.caution{background:#fff4e0;border-left:8px solid #E69F00;padding:.7em 1em;margin:1em 0;font-size:1.02em}
.caution ul{margin:.4em 0 0 0}
.banner{background:#fde4d6;border-left:8px solid #D55E00;padding:.6em 1em;margin:1em 0}
table{border-collapse:collapse;font-size:.82em}th,td{border:1px solid #ccc;padding:.2em .4em;text-align:right;
vertical-align:top}
th{background:#eef3f8;cursor:pointer;user-select:none;position:sticky;top:0;text-align:left;z-index:1}
th.nosort{cursor:default}td.t{text-align:left;white-space:nowrap}td.w{text-align:left;min-width:14em}
th.asc::after{content:" \\25B2"}th.desc::after{content:" \\25BC"}
tr:nth-child(even){background:#f8f8f8}.fam{display:inline-block;width:.8em;height:.8em;margin-right:.3em;
border:1px solid #333}
.flag{background:#D55E00;color:#fff;border-radius:3px;padding:0 .3em;margin-left:.3em;font-size:.85em}
.json{font-size:.8em;margin-left:.4em;color:#555}
details summary{cursor:pointer;color:#0072B2}details ul{margin:.3em 0;padding-left:1.2em;white-space:normal;
max-width:34em}
.controls,.review-bar{margin:.6em 0}.controls label,.review-bar label{margin-right:1.2em}
.review-bar{background:#eef3f8;padding:.5em .8em;border-radius:4px}
input.note{width:11em}select.decision{font-size:.95em}
td.state{text-align:left;white-space:nowrap}tr[data-state="accepted"] td.state{color:#009E73;font-weight:bold}
tr[data-state="rejected"] td.state{color:#D55E00;font-weight:bold}
tr[data-state="needs-work"] td.state{color:#0072B2;font-weight:bold}
tr[data-state="changed since review"] td.state{color:#fff;background:#D55E00;font-weight:bold}
.thumbs{display:flex;flex-wrap:wrap;gap:12px}.thumb{width:230px;font-size:.8em;border:1px solid #ddd;padding:4px}
.thumb img{width:100%;height:auto;border:1px solid #eee;cursor:zoom-in}.failed{color:#D55E00}
.figs img{max-width:100%;border:1px solid #ddd;margin-bottom:1em}.muted{color:#555}
#viewer{position:fixed;inset:0;background:rgba(0,0,0,.82);z-index:10;overflow:auto;padding:1em}
#viewer[hidden]{display:none}#viewer .bar{color:#fff;margin-bottom:.5em}#viewer .bar a{color:#9cd3ff;
margin-left:1em}
#viewer img{display:block;max-width:100%;margin:0 auto;background:#fff}
#viewer button{margin-left:1em}
"""

_JS = r"""
(function(){
  var table=document.getElementById('margins'); if(!table) return;
  var tbody=table.tBodies[0], heads=table.tHead.rows[0].cells, rows=Array.prototype.slice.call(tbody.rows);
  var STORE='clinometry-review:'+location.pathname, WHO='clinometry-reviewer';
  var COLUMNS=JSON.parse(table.getAttribute('data-review-columns'));
  function load(){try{return JSON.parse(localStorage.getItem(STORE)||'{}');}catch(e){return {};}}
  function save(s){try{localStorage.setItem(STORE,JSON.stringify(s));}catch(e){}}
  var stored=load();
  var reviewer=document.getElementById('reviewer');
  try{reviewer.value=localStorage.getItem(WHO)||'';}catch(e){}
  reviewer.addEventListener('input',function(){try{localStorage.setItem(WHO,reviewer.value);}catch(e){}});
  var LABEL={'accept':'accepted','reject':'rejected','needs-work':'needs-work'};
  // sorting by review state puts what needs a look first
  var ORDER={'changed since review':0,'needs-work':1,'accepted':2,'rejected':3,'':9};
  function picks(r){return {bt:r.getAttribute('data-bt'),bd:r.getAttribute('data-bd'),
    tt:r.getAttribute('data-tt'),td:r.getAttribute('data-td')};}
  function same(a,b){ // same break and toe traces, depths within 1 m (as clinometry.report.review)
    if(String(a.bt||'')!==String(b.bt||'')||String(a.tt||'')!==String(b.tt||'')) return false;
    var ks=['bd','td'];
    for(var i=0;i<2;i++){var x=a[ks[i]],y=b[ks[i]];
      if((x===''||x==null)!==(y===''||y==null)) return false;
      if(!(x===''||x==null)&&Math.abs(parseFloat(x)-parseFloat(y))>1.0) return false;}
    return true;}
  function embedded(r){var d=r.getAttribute('data-decision'); if(!d) return null;
    return {decision:d,note:r.getAttribute('data-note')||'',reviewer:r.getAttribute('data-reviewer')||'',
      time:r.getAttribute('data-time')||'',bt:r.getAttribute('data-rbt'),bd:r.getAttribute('data-rbd'),
      tt:r.getAttribute('data-rtt'),td:r.getAttribute('data-rtd')};}
  function current(r){var k=r.getAttribute('data-key'), s=stored[k], e=embedded(r);
    if(s&&e) return (String(s.time)>=String(e.time))?s:e; return s||e;}
  function state(r){var d=current(r); if(!d||!d.decision) return '';
    return same(d,picks(r))?LABEL[d.decision]:'changed since review';}
  function show(r){var d=current(r), st=state(r);
    var sel=r.querySelector('select.decision'), note=r.querySelector('input.note'), cell=r.querySelector('td.state');
    sel.value=d?d.decision:''; note.value=d?(d.note||''):'';
    sel.parentNode.setAttribute('data-v',sel.value); note.parentNode.setAttribute('data-v',note.value);
    cell.textContent=st||'not reviewed'; cell.setAttribute('data-v',ORDER[st]);
    cell.title=d&&d.decision?('decided '+(d.time||'')+(d.reviewer?' by '+d.reviewer:'')):'';
    r.setAttribute('data-state',st);}
  function decide(r){var sel=r.querySelector('select.decision'), note=r.querySelector('input.note');
    var k=r.getAttribute('data-key');
    if(!sel.value&&!note.value){delete stored[k];}
    else{var p=picks(r); stored[k]={decision:sel.value,note:note.value,reviewer:reviewer.value,
      time:new Date().toISOString(),bt:p.bt,bd:p.bd,tt:p.tt,td:p.td};}
    save(stored); show(r); counts(); filter();}
  rows.forEach(function(r){show(r);
    r.querySelector('select.decision').addEventListener('change',function(){decide(r);});
    r.querySelector('input.note').addEventListener('change',function(){decide(r);});});
  function counts(){var c={'accepted':0,'rejected':0,'needs-work':0,'changed since review':0,'':0};
    rows.forEach(function(r){c[r.getAttribute('data-state')||'']++;});
    document.getElementById('review-counts').textContent='accepted '+c['accepted']+' · rejected '+c['rejected']+
      ' · needs work '+c['needs-work']+' · changed since review '+c['changed since review']+' · not reviewed '+c[''];}
  // sorting
  function val(td,num){var v=td.getAttribute('data-v'); if(num){var f=parseFloat(v); return isNaN(f)?null:f;} return v||'';}
  for(var i=0;i<heads.length;i++){(function(i){
    if(heads[i].classList.contains('nosort')) return;
    heads[i].addEventListener('click',function(){
      var num=heads[i].getAttribute('data-num')==='1', asc=!heads[i].classList.contains('asc');
      for(var k=0;k<heads.length;k++){heads[k].classList.remove('asc','desc');}
      heads[i].classList.add(asc?'asc':'desc');
      var rs=Array.prototype.slice.call(tbody.rows);
      rs.sort(function(a,b){var x=val(a.cells[i],num),y=val(b.cells[i],num);
        if(x===null&&y===null) return 0; if(x===null) return 1; if(y===null) return -1;
        var c=num?(x-y):String(x).localeCompare(String(y)); return asc?c:-c;});
      rs.forEach(function(r){tbody.appendChild(r);});
    });})(i);}
  // filtering: the table and the thumbnails
  var fam=document.getElementById('f-family'), conf=document.getElementById('f-conf'),
      rev=document.getElementById('f-review'), shown=document.getElementById('n-shown');
  var thumbs=Array.prototype.slice.call(document.querySelectorAll('.thumb'));
  function filter(){var f=fam.value, c=parseFloat(conf.value)||0, v=rev.value, n=0, stems={};
    rows.forEach(function(r){
      var st=r.getAttribute('data-state')||'';
      var ok=(f===''||r.getAttribute('data-family')===f)&&(parseFloat(r.getAttribute('data-confidence'))||0)>=c
        &&(v===''||(v==='none'?st==='':st===v));
      r.style.display=ok?'':'none'; if(ok){n++; stems[r.getAttribute('data-stem')]=1;}});
    shown.textContent=n;
    var any=(f!==''||c>0||v!=='');
    thumbs.forEach(function(t){var ok=stems[t.getAttribute('data-stem')]||(!any);
      t.style.display=ok?'':'none';});
    var ts=document.getElementById('n-thumbs'); if(ts) ts.textContent=thumbs.filter(function(t){return t.style.display!=='none';}).length;}
  fam.addEventListener('change',filter); conf.addEventListener('input',filter); rev.addEventListener('change',filter);
  // export and import of review.csv
  var FREE={file:1,line:1,note:1,reviewer:1,stem:1}; // free text: the only cells a spreadsheet might run
  function cell(v,k){v=(v==null)?'':String(v);
    if(FREE[k]&&/^[=+\-@\t\r]/.test(v)) v="'"+v; // a spreadsheet must not run it as a formula
    return /[",\r\n]/.test(v)?'"'+v.replace(/"/g,'""')+'"':v;}
  function reviewCsv(){var out=[COLUMNS.join(',')];
    rows.forEach(function(r){var d=current(r); if(!d||!d.decision) return;
      var rec={file:r.getAttribute('data-file'),line:r.getAttribute('data-line'),direction:r.getAttribute('data-direction'),
        decision:d.decision,note:d.note,reviewer:d.reviewer,time:d.time,stem:r.getAttribute('data-stem'),
        break_trace:d.bt,break_depth_m:d.bd,toe_trace:d.tt,toe_depth_m:d.td};
      out.push(COLUMNS.map(function(k){return cell(rec[k],k);}).join(','));});
    return out.join('\n')+'\n';}
  window.clinometryReviewCsv=reviewCsv;
  document.getElementById('export').addEventListener('click',function(){
    var blob=new Blob([reviewCsv()],{type:'text/csv'}), a=document.createElement('a');
    a.href=URL.createObjectURL(blob); a.download='review.csv'; document.body.appendChild(a); a.click();
    setTimeout(function(){URL.revokeObjectURL(a.href); a.remove();},1000);});
  function parseCsv(text){var out=[],row=[],f='',q=false;
    for(var i=0;i<text.length;i++){var ch=text[i];
      if(q){if(ch==='"'){if(text[i+1]==='"'){f+='"';i++;}else q=false;}else f+=ch;}
      else if(ch==='"') q=true; else if(ch===','){row.push(f);f='';}
      else if(ch==='\n'||ch==='\r'){if(ch==='\r'&&text[i+1]==='\n') i++; row.push(f);f='';out.push(row);row=[];}
      else f+=ch;}
    if(f!==''||row.length){row.push(f);out.push(row);} return out;}
  function unq(v){return (v&&v.length>1&&v[0]==="'"&&/[=+\-@\t\r]/.test(v[1]))?v.slice(1):(v||'');}
  function keyOf(file,line,dir){return JSON.stringify([file,line,dir]);}
  var byKey={}; rows.forEach(function(r){var k=keyOf(r.getAttribute('data-file'),r.getAttribute('data-line'),
    r.getAttribute('data-direction')); (byKey[k]=byKey[k]||[]).push(r);});
  document.getElementById('import').addEventListener('change',function(ev){
    var file=ev.target.files[0]; if(!file) return; var fr=new FileReader();
    fr.onload=function(){var t=parseCsv(String(fr.result).replace(/^\ufeff/,'')), head=t.shift()||[], n=0, miss=0,
        old=0, recs=[], exact={}, near={};
      t.forEach(function(cells){if(cells.length<2) return; var rec={};
        head.forEach(function(h,j){rec[h]=unq(cells[j]);});
        if(!rec.decision) return;
        rec.cand=byKey[keyOf(rec.file,rec.line,rec.direction)]||[];
        if(!rec.cand.length){miss++; return;}
        // files of one name in two folders: a decision naming the output stem of one is for that one only
        var st=rec.stem||'', own=rec.cand.filter(function(x){return x.getAttribute('data-stem')===st;});
        if(st&&own.length) rec.cand=own;
        rec.p={bt:rec.break_trace,bd:rec.break_depth_m,tt:rec.toe_trace,td:rec.toe_depth_m}; recs.push(rec);});
      function put(r,rec){stored[r.getAttribute('data-key')]={decision:rec.decision,note:rec.note||'',
        reviewer:rec.reviewer||'',time:rec.time||new Date().toISOString(),bt:rec.p.bt,bd:rec.p.bd,tt:rec.p.tt,
        td:rec.p.td}; n++;}
      // as clinometry.report.review.apply_review: each decision goes to one margin, the one with the picks
      // it was made on, else the nearest by break and toe trace unless that one has a decision on its picks
      recs.forEach(function(rec){var r=rec.cand.filter(function(x){return same(rec.p,picks(x));})[0];
        if(r){exact[r.getAttribute('data-key')]=1; rec.done=1; put(r,rec);}});
      function far(a,b){var one=0,tr=0;['bt','tt'].forEach(function(k){var x=a[k],y=b[k];
        if((x===''||x==null)!==(y===''||y==null)) one++; else if(!(x===''||x==null)) tr+=Math.abs(parseFloat(x)-parseFloat(y));});
        return one*1e9+tr;}
      recs.forEach(function(rec){if(rec.done) return;
        var r=rec.cand.slice().sort(function(a,b){return far(rec.p,picks(a))-far(rec.p,picks(b));})[0],
            k=r.getAttribute('data-key'), d=far(rec.p,picks(r));
        if(exact[k]){old++; return;}
        if(near[k]&&d>near[k].d){old++; return;} if(near[k]) old++; near[k]={d:d,r:r,rec:rec};});
      Object.keys(near).forEach(function(k){put(near[k].r,near[k].rec);});
      save(stored); rows.forEach(show); counts(); filter();
      document.getElementById('import-result').textContent=n+' decision(s) read'+(miss?', '+miss+' for margins not on this page':'')
        +(old?', '+old+' older one(s) for margins reviewed again':'');};
    fr.readAsText(file);});
  // the QC figure, large, in the page
  var viewer=document.getElementById('viewer'), vimg=document.getElementById('viewer-img');
  function openFig(a){vimg.src=a.getAttribute('href'); document.getElementById('viewer-title').textContent=a.getAttribute('data-title')||'';
    var j=document.getElementById('viewer-json'), js=a.getAttribute('data-json');
    j.style.display=js?'':'none'; if(js) j.href=js; document.getElementById('viewer-png').href=a.getAttribute('href');
    viewer.hidden=false;}
  function closeFig(){viewer.hidden=true; vimg.removeAttribute('src');}
  Array.prototype.forEach.call(document.querySelectorAll('a.qc'),function(a){
    a.addEventListener('click',function(e){if(e.ctrlKey||e.metaKey||e.shiftKey) return; e.preventDefault(); openFig(a);});});
  document.getElementById('viewer-close').addEventListener('click',closeFig);
  viewer.addEventListener('click',function(e){if(e.target===viewer) closeFig();});
  document.addEventListener('keydown',function(e){if(e.key==='Escape') closeFig();});
  // a link may preset the view: index.html#family=ramp&conf=0.5&sort=slope_max_deg&review=accepted
  location.hash.replace(/^#/,'').split('&').forEach(function(kv){
    var p=kv.split('='), v=decodeURIComponent(p[1]||'');
    if(p[0]==='family') fam.value=v;
    if(p[0]==='conf') conf.value=v;
    if(p[0]==='review') rev.value=v;
    if(p[0]==='sort'){for(var k=0;k<heads.length;k++){if(heads[k].getAttribute('data-key')===v){heads[k].click(); break;}}}
  });
  counts(); filter();
})();
"""

_FAMILY_SWATCH = {"ramp": "#009E73", "rimmed_shelf": "#0072B2", "steep_margin": "#D55E00"}


def _e(v) -> str:
    return html.escape("" if v is None else str(v), quote=True)


def _href(name) -> str:
    return _e(quote(str(name)))


def _num_cell(v, digits):
    try:
        num = float(v)
    except (TypeError, ValueError):
        return '<td data-v="">–</td>'
    if num != num:  # NaN
        return '<td data-v="">–</td>'
    return f'<td data-v="{num!r}">{num:.{digits}f}</td>'


def _line_link(row):
    text = str(row.get("stem") or "")
    title = " ".join(s for s in (os.path.basename(str(row.get("file") or "")), str(row.get("line") or "")) if s)
    json_link = f'<a class="json" href="{_href(row["json"])}">JSON</a>' if row.get("json") else ""
    if row.get("png"):
        js = f' data-json="{_href(row["json"])}"' if row.get("json") else ""
        link = (f'<a class="qc" href="{_href(row["png"])}" data-title="{_e(title)}"{js} '
                f'title="open the QC figure">{_e(text)}</a>')
    elif row.get("json"):
        link = f'<a href="{_href(row["json"])}">{_e(text)}</a>'
        json_link = ""
    else:
        link = _e(text)
    return f'<td class="t" data-v="{_e(text)}">{link}{json_link}</td>'


def _cell(row, key, kind):
    v = row.get(key)
    if kind == "p10-p90":
        lo, hi = row.get(f"{key}_p10"), row.get(f"{key}_p90")
        digits = 0 if key.endswith("_m") else 1
        try:
            lo, hi = float(lo), float(hi)
        except (TypeError, ValueError):
            return '<td data-v="">–</td>'
        return f'<td class="t" data-v="{lo!r}">{lo:.{digits}f} – {hi:.{digits}f}</td>'
    if kind == "reasons":
        reasons = [user_text(r) for r in (row.get("reasons") or [])]
        missing = [f"not measured: {user_text(f'{k}: {why}')}" for k, why in (row.get("missing") or {}).items()]
        items = reasons + missing
        if not items:
            return '<td class="w" data-v="">–</td>'
        first = items[0] if len(items[0]) <= 36 else items[0][:33].rstrip() + "..."
        return (f'<td class="w" data-v="{len(items)}"><details><summary>{_e(first)}</summary><ul>'
                + "".join(f"<li>{_e(x)}</li>" for x in items) + "</ul></details></td>")
    if kind == "decision":
        opts = "".join(f'<option value="{d}">{d}</option>' for d in ("accept", "reject", "needs-work"))
        return f'<td class="t" data-v=""><select class="decision"><option value="">–</option>{opts}</select></td>'
    if kind == "note":
        return '<td class="t" data-v=""><input class="note" type="text" placeholder="note"></td>'
    if kind == "state":
        return '<td class="state" data-v="9">not reviewed</td>'
    if kind is not None:
        return _num_cell(v, kind)
    text = "" if v is None else str(v)
    if key == "stem":
        return _line_link(row)
    if key == "family":
        sw = _FAMILY_SWATCH.get(text, "#7f7f7f")
        return (f'<td class="t" data-v="{_e(text)}"><span class="fam" style="background:{sw}"></span>'
                f"{_e(text or 'unclassified')}</td>")
    if key == "direction":
        words = {"+": "higher traces", "-": "lower traces"}.get(text, text)
        return f'<td class="t" data-v="{_e(text)}" title="the basin lies towards {_e(words)}">{_e(words)}</td>'
    if key == "velocity_model" and row.get("default_velocity") == "yes":
        return (f'<td class="t" data-v="{_e(text)}">{_e(text)}<span class="flag" '
                f'title="{_e(DEFAULT_VELOCITY_FLAG)}">default</span></td>')
    return f'<td class="t" data-v="{_e(text)}">{_e(text)}</td>'


def _row_attrs(r, key):
    """The data-* attributes of a margin row: what the script filters, matches and exports on."""
    fam = r.get("family") or "unclassified"
    conf = r.get("confidence")
    attrs = {
        "data-family": fam, "data-confidence": conf if conf is not None else 0, "data-key": key,
        "data-file": os.path.basename(str(r.get("file") or "").replace("\\", "/")), "data-line": r.get("line") or "",
        "data-direction": r.get("direction") or "", "data-stem": r.get("stem") or "",
        "data-bt": _plain(r.get("break_trace")), "data-bd": _plain(r.get("break_depth_m"), 1),
        "data-tt": _plain(r.get("toe_trace")), "data-td": _plain(r.get("toe_depth_m"), 1),
        "data-default-velocity": "1" if r.get("default_velocity") == "yes" else "0",
    }
    if r.get("decision"):
        rp = r.get("review_picks") or {}
        attrs.update({"data-decision": r["decision"], "data-note": r.get("note") or "",
                      "data-reviewer": r.get("reviewer") or "", "data-time": r.get("review_time") or "",
                      "data-rbt": _plain(rp.get("break_trace")), "data-rbd": _plain(rp.get("break_depth_m"), 1),
                      "data-rtt": _plain(rp.get("toe_trace")), "data-rtd": _plain(rp.get("toe_depth_m"), 1)})
    return " ".join(f'{k}="{_e(v)}"' for k, v in attrs.items())


def _plain(v, digits=None):
    if v is None or v == "":
        return ""
    try:
        f = float(v)
    except (TypeError, ValueError):
        return ""
    if digits is None:
        return str(int(f))
    return f"{f:.{digits}f}"


def _keys(margins):
    """A key per margin row, unique on the page: file, line, basin side (and a count where they repeat)."""
    seen, out = {}, []
    for r in margins:
        base = (os.path.basename(str(r.get("file") or "").replace("\\", "/")), str(r.get("line") or ""),
                str(r.get("direction") or ""))
        n = seen.get(base, 0)
        seen[base] = n + 1
        out.append("|".join(base) + (f"|{n + 1}" if n else ""))
    return out


def margin_details(result) -> list:
    """Per margin of a result (contract dict): its reasons and what was not measured, for the page's rows.

    Examples
    --------
    >>> margin_details({"margins": [{"reasons": ["slope 0.9° (Read 1985, from memory)"], "missing": {}}]})
    [{'reasons': ['slope 0.9° (Read 1985)'], 'missing': {}}]
    """
    return [{"reasons": [user_text(r) for r in (m.get("reasons") or [])],
             "missing": {str(k): user_text(v) for k, v in (m.get("missing") or {}).items()}}
            for m in result.get("margins", []) or []]


def _default_velocity_banner(lines):
    flagged = [ln for ln in lines if ln.get("default_velocity")]
    if not flagged:
        return ""
    names = ", ".join(_e(ln.get("stem")) for ln in flagged[:8]) + (" ..." if len(flagged) > 8 else "")
    return ('<div class="banner" id="default-velocity"><strong>Default velocity.</strong> '
            f"{len(flagged)} of {len(lines)} line(s) were converted to depth with the package default velocity "
            "because no velocity was given: their depths, reliefs and true slopes are approximate (off by 30 % or "
            "more is possible). Rerun them with --velocity, --velocity-linear or --velocity-file. "
            f'<span class="muted">Lines: {names}</span></div>')


def index_html(*, margins, lines, errors, summary_png=None, map_png=None, title="clinometry batch review",
               cautions=None) -> str:
    """Build the review page as a string.

    Parameters
    ----------
    margins : list of dict
        Rows of the margins table (:func:`clinometry.report.tables.margin_rows`),
        optionally with ``json`` and ``png`` (relative links to the line's
        result and QC figure), ``reasons`` and ``missing``
        (:func:`margin_details`), and the review of
        :func:`clinometry.report.review.apply_review` (``decision``,
        ``note``, ``reviewer``, ``review_time``, ``review_status``).
    lines : list of dict
        One per line: ``stem``, ``file``, ``line``, ``status`` (``"ok"`` or
        ``"failed"``), ``png`` and ``json`` (relative names or None),
        ``n_margins``, optionally ``default_velocity`` (bool) and
        ``velocity`` (label).
    errors : list of dict
        Rows of the errors table (``file, line, error_type, message``).
    summary_png, map_png : str, optional
        Relative names of the summary and map figures.
    title : str
    cautions : sequence of str, optional
        Cautions recorded in the results; those that repeat the page's own
        caution (the pipeline's standard ones) are not shown again.

    Returns
    -------
    str
        A complete HTML5 document with inline CSS and JS and only relative
        links.
    """
    from ..pipeline.chain import CAUTIONS

    out = ["<!DOCTYPE html>", '<html lang="en"><head><meta charset="utf-8">',
           '<meta name="viewport" content="width=device-width, initial-scale=1">',
           f"<title>{_e(title)}</title><style>{_CSS}</style></head><body>",
           f"<h1>{_e(title)}</h1>"]
    n_ok = sum(1 for ln in lines if ln.get("status") == "ok")
    out.append(f'<p class="muted">{len(lines)} line(s): {n_ok} analysed, {len(errors)} failed; '
               f"{len(margins)} margin(s) found.</p>")
    out.append('<div class="caution" id="caution"><strong>Caution.</strong> ' + _e(CAUTION_TEXT))
    extra = [c for c in dict.fromkeys(cautions or []) if c and c not in CAUTIONS]
    if extra:
        out.append("<ul>" + "".join(f"<li>{_e(user_text(c))}</li>" for c in extra) + "</ul>")
    out.append("</div>")
    out.append(_default_velocity_banner(lines))

    out.append('<h2 id="margins-heading">Margins</h2>')
    out.append('<div class="review-bar" id="review-bar"><label>reviewer <input id="reviewer" type="text" '
               'placeholder="your name"></label><button id="export" type="button">Export review.csv</button> '
               '<label>import review.csv <input id="import" type="file" accept=".csv,text/csv"></label>'
               '<span id="import-result" class="muted"></span><br><span id="review-counts"></span><br>'
               '<span class="muted">Decisions and notes are kept in this browser for this page. Export them and '
               "pass the file to <code>clinometry batch ... --review review.csv</code> to write "
               "margins_reviewed.csv (accepted margins with their notes) and mark the figures.</span></div>")
    families = sorted({str(r.get("family")) for r in margins if r.get("family")})
    out.append('<div class="controls">'
               '<label>family <select id="f-family"><option value="">all</option>'
               + "".join(f'<option value="{_e(f)}">{_e(f)}</option>' for f in families)
               + '<option value="unclassified">unclassified</option></select></label>'
               '<label>minimum confidence <input id="f-conf" type="number" min="0" max="1" step="0.05" value="0">'
               '</label><label>review <select id="f-review"><option value="">all</option>'
               '<option value="none">not reviewed</option><option value="accepted">accepted</option>'
               '<option value="rejected">rejected</option><option value="needs-work">needs work</option>'
               '<option value="changed since review">changed since review</option></select></label>'
               '<span class="muted">showing <span id="n-shown">'
               f"{len(margins)}</span> of {len(margins)}; click a heading to sort</span></div>")
    out.append(f'<table id="margins" data-review-columns="{_e(_json_list(REVIEW_COLUMNS))}"><thead><tr>')
    for key, head, kind in TABLE_COLUMNS:
        num = 1 if isinstance(kind, int) or kind in ("p10-p90", "state") else 0
        nosort = ' class="nosort"' if kind in ("reasons",) else ""
        out.append(f'<th data-key="{_e(key)}" data-num="{num}"{nosort}>{_e(head)}</th>')
    out.append("</tr></thead><tbody>")
    for r, key in zip(margins, _keys(margins)):
        out.append(f"<tr {_row_attrs(r, key)}>")
        out.extend(_cell(r, k, kind) for k, _, kind in TABLE_COLUMNS)
        out.append("</tr>")
    out.append("</tbody></table>")

    if summary_png or map_png:
        out.append('<h2 id="figures">Summary and map</h2><div class="figs">')
        for name, alt in ((summary_png, "slope and relief per margin family"),
                          (map_png, "shelf-break map by family and depth")):
            if name:
                out.append(f'<a href="{_href(name)}"><img src="{_href(name)}" alt="{_e(alt)}"></a>')
        out.append("</div>")

    out.append(f'<h2 id="lines">Lines <span class="muted">(<span id="n-thumbs">{len(lines)}</span> shown; '
               "they follow the table's filter)</span></h2><div class=\"thumbs\">")
    for ln in lines:
        label = " ".join(str(s) for s in (ln.get("file"), ln.get("line")) if s)
        out.append(f'<div class="thumb" data-stem="{_e(ln.get("stem"))}">')
        js = f' data-json="{_href(ln["json"])}"' if ln.get("json") else ""
        if ln.get("png"):
            out.append(f'<a class="qc" href="{_href(ln["png"])}" data-title="{_e(label)}"{js}>'
                       f'<img src="{_href(ln["png"])}" alt="QC figure of {_e(label)}" loading="lazy"></a>')
        status = ln.get("status")
        cls = ' class="failed"' if status != "ok" else ""
        out.append(f"<div{cls}><strong>{_e(ln.get('stem'))}</strong><br>{_e(label)}<br>")
        if status == "ok":
            out.append(f"{_e(ln.get('n_margins', 0))} margin(s)")
            if ln.get("default_velocity"):
                out.append('<span class="flag">default velocity</span>')
        else:
            out.append("failed (see errors)")
        links = []
        if ln.get("png"):
            links.append(f'<a class="qc" href="{_href(ln["png"])}" data-title="{_e(label)}"{js}>QC figure</a>')
        if ln.get("json"):
            links.append(f'<a href="{_href(ln["json"])}">JSON</a>')
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
    out.append('<div id="viewer" hidden><div class="bar"><span id="viewer-title"></span>'
               '<a id="viewer-png" href="#">open the PNG</a><a id="viewer-json" href="#">JSON</a>'
               '<button id="viewer-close" type="button">close (Esc)</button></div>'
               '<img id="viewer-img" alt="QC figure"></div>')
    out.append(f"<script>{_JS}</script></body></html>")
    return "\n".join(out)


def _json_list(items) -> str:
    import json

    return json.dumps(list(items))


def write_index(path, **kwargs):
    """Write :func:`index_html` to ``path`` atomically; returns the path."""
    return atomic_write(path, index_html(**kwargs))
