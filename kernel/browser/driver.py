#!/usr/bin/python3
"""Open one notebook in a running Chromium, run all its cells, report what the page shows.

The browser is driven through the Chrome DevTools Protocol over the websocket
client of python3-tornado (Debian package), so nothing beyond Debian's
packages is needed. The caller starts Chromium (with --remote-debugging-port)
and the notebook server, and passes the browser's websocket address:

    driver.py --devtools ws://127.0.0.1:PORT/devtools/browser/ID \
        --url 'http://127.0.0.1:8888/notebooks/02-x.ipynb?token=T' \
        --screenshot build/browser/02-x.png [--figure-text 'beam radius'] \
        [--kernel-timeout 120] [--run-timeout 300]

Steps: open a new tab, load the notebook, detect the front-end (classic
Notebook 6: window.Jupyter; Notebook 7 and JupyterLab: window.jupyterapp,
which the driver has the page expose by setting exposeAppInBrowser in the
page config before the application starts), wait until the kernel is
connected, run every cell as Cell > Run All does, wait until no cell is
running and the kernel is idle, collect per cell the execution count, error
outputs, stdout and stderr text and inline <svg> figures (their rendered
size, text drawn past their edge), the notebook as the page holds it
(nbformat JSON), JavaScript exceptions and console errors, and save a PNG
of the whole notebook. Live what-if controls (kernel/nb/live) that appear
while the cells run are exercised (see exercise_live) and reported under
"live". Only the Notebook 6 path has been run (Debian 12
packages no Notebook 7 or JupyterLab).

It prints one JSON object on stdout. On failure (timeout, dead kernel, page
error) the object has "error" set, still carries what could be collected and
the screenshot is still taken when possible; the exit status is then 1.
Usage errors exit 2. Judging the result is left to the caller
(kernel/browser/browser_test.go).
"""

import argparse
import asyncio
import base64
import json
import sys
import time

from tornado.websocket import websocket_connect

# Page-side helpers, installed once per page load. Every function returns
# plain JSON values. ui() is "" until a known front-end is ready.
HELPERS = r"""
(() => {
  if (window.__beamnote) return true;
  const bn = window.__beamnote = {events: []};
  const text = (el) => (el ? el.innerText : '');
  const lab = () => {
    const app = window.jupyterapp;
    const w = app && app.shell && app.shell.currentWidget;
    return w && w.content && w.content.model && w.sessionContext ? w : null;
  };
  bn.ui = () => {
    const J = window.Jupyter;
    if (J && J.notebook && J.notebook._fully_loaded) return 'notebook6';
    if (lab()) return 'lab';
    return '';
  };
  bn.watch = () => {
    if (bn.watching) return;
    bn.watching = true;
    if (bn.ui() === 'notebook6') {
      Jupyter.notebook.events.on(
        'kernel_dead.Kernel kernel_killed.Kernel kernel_restarting.Kernel ' +
        'kernel_autorestarting.Kernel kernel_disconnected.Kernel',
        (e) => bn.events.push(e.type + '.' + e.namespace));
    } else {
      lab().sessionContext.statusChanged.connect((_, s) => {
        if (s === 'dead' || s === 'restarting' || s === 'autorestarting') bn.events.push(s);
      });
    }
  };
  bn.kernel = () => {
    if (bn.ui() === 'notebook6') {
      const k = Jupyter.notebook.kernel;
      const icon = document.getElementById('kernel_indicator_icon');
      const m = icon && /kernel_(\w+?)_icon/.exec(icon.className);
      const ready = !!(k && k.is_connected() && k.info_reply && Object.keys(k.info_reply).length);
      return {ready, name: k ? k.name : '', status: m ? m[1] : ''};
    }
    const s = lab().sessionContext;
    const k = s.session && s.session.kernel;
    return {ready: !!(k && s.isReady && k.connectionStatus === 'connected'),
            name: k ? k.name : '', status: k ? k.status : ''};
  };
  bn.runAll = () => {
    if (bn.ui() === 'notebook6') {
      // What Cell > Run All does (menu item run_all_cells).
      Jupyter.notebook.execute_all_cells();
    } else {
      // Run > Run All Cells; not awaited, the caller polls bn.state().
      jupyterapp.commands.execute('notebook:run-all-cells');
    }
    return true;
  };
  const cells = () => {
    if (bn.ui() === 'notebook6') {
      return Jupyter.notebook.get_cells().map((c) => ({
        type: c.cell_type, el: c.element[0], source: c.get_text(),
        count: c.cell_type === 'code' ? c.input_prompt_number : undefined,
        prompt: text(c.element[0].querySelector('.input_prompt')),
        running: c.element[0].classList.contains('running'),
        outputs: null,
      }));
    }
    return lab().content.widgets.map((w) => {
      const prompt = text(w.node.querySelector('.jp-InputPrompt'));
      return {
        type: w.model.type, el: w.node, source: w.model.sharedModel ? w.model.sharedModel.getSource() : w.model.value.text,
        count: w.model.executionCount, prompt, running: prompt.includes('*'),
        outputs: w.model.outputs ? w.model.outputs.toJSON() : [],
      };
    });
  };
  bn.state = () => {
    const busy = [];
    cells().forEach((c, i) => { if (c.type === 'code' && c.running) busy.push(i); });
    return {busy, kernel: bn.kernel(), events: bn.events};
  };
  const CUT = 3;
  const svgs = (root, figureText) => {
    if (!root) return [];
    return [...root.querySelectorAll('svg')].filter((s) => !s.parentElement.closest('svg')).map((s) => {
      const r = s.getBoundingClientRect();
      const fig = s.closest('.beamnote-figure');
      // Text drawn past the figure's edge is cut off: the layout assumed
      // other font metrics than the browser's (a missing font). A text's box
      // includes the font's line gap, so a label at the edge pokes out a
      // pixel or two; CUT px are allowed.
      const cut = [...s.querySelectorAll('text')].filter((t) => {
        const b = t.getBoundingClientRect();
        return b.width > 0 && (b.left < r.left - CUT || b.right > r.right + CUT || b.top < r.top - CUT || b.bottom > r.bottom + CUT);
      }).map((t) => { const b = t.getBoundingClientRect(); return t.textContent.trim() + " [" + [b.left - r.left, r.right - b.right, b.top - r.top, r.bottom - b.bottom].map(Math.round).join(",") + "]"; });
      const fonts = [...new Set([...s.querySelectorAll('text')].map((t) => getComputedStyle(t).fontFamily))];
      return {width: r.width, height: r.height, texts: s.querySelectorAll('text').length,
              has_figure_text: !!figureText && s.textContent.includes(figureText),
              caption: fig ? fig.title : '', cut_text: cut, fonts};
    });
  };
  bn.facts = (figureText) => cells().map((c, i) => {
    const f = {index: i, type: c.type};
    if (c.type !== 'code') return f;
    f.source = c.source;
    f.execution_count = typeof c.count === 'number' ? c.count : null;
    f.prompt = c.prompt.trim();
    f.running = c.running;
    if (c.outputs === null) {
      f.errors = [...c.el.querySelectorAll('.output_error')].map(text);
      f.stderr = [...c.el.querySelectorAll('.output_stderr')].map(text);
      f.stdout = [...c.el.querySelectorAll('.output_stdout')].map(text);
      f.svgs = svgs(c.el.querySelector('.output_wrapper'), figureText);
    } else {
      f.errors = c.outputs.filter((o) => o.output_type === 'error')
        .map((o) => [o.ename + ': ' + o.evalue].concat(o.traceback || []).join('\n'));
      const stream = (name) => c.outputs.filter((o) => o.output_type === 'stream' && o.name === name)
        .map((o) => [].concat(o.text).join(''));
      f.stderr = stream('stderr');
      f.stdout = stream('stdout');
      f.svgs = svgs(c.el.querySelector('.jp-Cell-outputWrapper, .jp-OutputArea'), figureText);
    }
    return f;
  });
  // Live what-ifs (kernel/nb/live): controls whose script is wired.
  bn.liveActive = () => [...document.querySelectorAll('.beamnote-live[data-state="live"]')].map((e) => e.id);
  const cellOf = (el) => el.closest('.cell, .jp-Cell') || document.body;
  bn.cellIndex = (id) => {
    const el = document.getElementById(id);
    return el ? cells().findIndex((c) => c.el.contains(el)) : -1;
  };
  bn.liveSliders = (id) => {
    const root = document.getElementById(id);
    if (!root) return [];
    return [...root.querySelectorAll('input[type=range]')].map((el) => ({
      name: root.querySelector('label[for="' + el.id + '"]').textContent,
      n: Number(el.max), value: Number(el.value)}));
  };
  // The live figure of the cell: the first figure or render error in it.
  const liveFigure = (cell) => cell.querySelector('.beamnote-figure, .beamnote-live-error');
  const frames = () => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r)));
  // liveMove moves slider i of the controls id to positions ks in one go
  // (input events, as a drag sends), and resolves when the cell's figure
  // shows the last value: ms from the first event to the figure in the
  // DOM, painted_ms to two frames later; changed: the figure's markup
  // differs from before; updates: how many times the figure was replaced.
  bn.liveMove = (id, i, ks, timeoutMs) => new Promise((resolve) => {
    const root = document.getElementById(id);
    if (!root) { resolve({error: 'no live controls ' + id}); return; }
    const cell = cellOf(root);
    const input = root.querySelectorAll('input[type=range]')[i];
    const name = root.querySelector('label[for="' + input.id + '"]').textContent;
    const out = root.querySelector('output[for="' + input.id + '"]');
    const before = liveFigure(cell);
    const beforeHTML = before ? before.outerHTML : '';
    let seen = before, updates = 0, obs = null, timer = null, finished = false;
    const t0 = performance.now();
    for (const k of ks) {
      input.value = String(k);
      input.dispatchEvent(new Event('input', {bubbles: true}));
    }
    input.dispatchEvent(new Event('change', {bubbles: true}));
    const want = name + ' = ' + out.textContent;
    const finish = (res) => {
      if (finished) return;
      finished = true;
      if (obs) obs.disconnect();
      clearTimeout(timer);
      res.want = want;
      res.updates = updates;
      resolve(res);
    };
    const check = () => {
      const f = liveFigure(cell);
      if (f && f !== seen) { seen = f; updates++; }
      if (f && (f.title || f.textContent).includes(want)) {
        const ms = performance.now() - t0;
        const changed = f.outerHTML !== beforeHTML;
        frames().then(() => finish({ms, painted_ms: performance.now() - t0, changed, error: ''}));
        obs.disconnect();
      }
    };
    obs = new MutationObserver(check);
    obs.observe(cell, {childList: true, subtree: true, attributes: true, characterData: true});
    timer = setTimeout(() => {
      const f = liveFigure(cell);
      finish({error: 'the figure did not show ' + want + ' within ' + timeoutMs + ' ms (it shows ' +
        JSON.stringify(f ? (f.title || f.textContent.slice(0, 120)) : null) + ')', ms: timeoutMs});
    }, timeoutMs);
    check();
  });
  bn.liveDone = (id) => {
    const root = document.getElementById(id);
    if (!root) return false;
    root.querySelector('.beamnote-live-done').click();
    return true;
  };
  // liveEnded: the controls are gone and the cell shows the end line.
  bn.liveEnded = (index) => {
    const c = cells()[index];
    if (!c) return '';
    const e = c.el.querySelector('.beamnote-live-ended');
    return !c.el.querySelector('.beamnote-live') && e ? e.textContent : '';
  };
  bn.notebook = () => (bn.ui() === 'notebook6' ? Jupyter.notebook.toJSON() : lab().content.model.toJSON());
  // The element that scrolls the notebook (the page itself does not).
  bn.scroller = () => {
    if (bn.ui() === 'notebook6') return document.getElementById('site');
    const n = lab().content.node;
    return [n, n.querySelector('.jp-WindowedPanel-outer')].find((e) => e && e.scrollHeight > e.clientHeight) || n;
  };
  // fullHeight: the window height at which the notebook needs no scrolling.
  bn.fullHeight = () => {
    const s = bn.scroller();
    s.scrollTop = 0;
    return Math.ceil(window.innerHeight + s.scrollHeight - s.clientHeight);
  };
  bn.overflow = () => { const s = bn.scroller(); return s.scrollHeight - s.clientHeight; };
  bn.quiet = () => {
    // Let the tab close without the "leave page?" prompt of a changed notebook.
    window.onbeforeunload = null;
    if (window.jQuery) jQuery(window).off('beforeunload');
    return true;
  };
  return true;
})()
"""

# Runs before any page script: Notebook 7 and JupyterLab assign
# window.jupyterapp only when their page config says exposeAppInBrowser, so
# set it in the config element as soon as the parser inserts it, before the
# application's bundle (a later script) reads it.
EXPOSE_APP = r"""
(() => {
  // The parser may insert the element before all of its text: patch once
  // the text parses as JSON.
  new MutationObserver((records, obs) => {
    const el = document.getElementById('jupyter-config-data');
    if (!el) return;
    try {
      const c = JSON.parse(el.textContent);
      c.exposeAppInBrowser = true;
      el.textContent = JSON.stringify(c);
      obs.disconnect();
    } catch (e) {}
  }).observe(document, {childList: true, subtree: true, characterData: true});
})();
"""

VIEW_WIDTH, VIEW_HEIGHT = 1280, 900
# Chromium cannot capture a page taller than its largest texture; beyond
# this the screenshot is cut at the bottom (and says so in "warnings").
MAX_SHOT_HEIGHT = 16000


class DriverError(Exception):
    """A step of the driver failed; the message says which."""


class LoadError(DriverError):
    """The notebook page could not be loaded at all."""


class CDP:
    """A minimal Chrome DevTools Protocol client over one browser websocket."""

    def __init__(self, ws):
        self.ws = ws
        self.next_id = 0
        self.pending = {}
        self.events = []  # (sessionId, method, params), kept for the caller
        self.reader = asyncio.ensure_future(self._read())

    @classmethod
    async def connect(cls, url):
        # Screenshots and notebooks with figures exceed tornado's default
        # 10 MiB message limit.
        ws = await websocket_connect(url, connect_timeout=10, max_message_size=512 << 20)
        return cls(ws)

    async def _read(self):
        while True:
            msg = await self.ws.read_message()
            if msg is None:
                for fut in self.pending.values():
                    if not fut.done():
                        fut.set_exception(DriverError("the DevTools connection to Chromium closed"))
                self.pending.clear()
                return
            m = json.loads(msg)
            if "id" in m:
                fut = self.pending.pop(m["id"], None)
                if fut and not fut.done():
                    if "error" in m:
                        fut.set_exception(DriverError("DevTools: %s" % m["error"].get("message", m["error"])))
                    else:
                        fut.set_result(m.get("result", {}))
            else:
                self.events.append((m.get("sessionId"), m.get("method"), m.get("params", {})))

    async def send(self, method, params=None, session=None, timeout=30):
        self.next_id += 1
        msg = {"id": self.next_id, "method": method, "params": params or {}}
        if session:
            msg["sessionId"] = session
        fut = asyncio.get_running_loop().create_future()
        self.pending[self.next_id] = fut
        await self.ws.write_message(json.dumps(msg))
        try:
            return await asyncio.wait_for(fut, timeout)
        except asyncio.TimeoutError:
            raise DriverError("DevTools %s: no answer within %d s" % (method, timeout)) from None

    def close(self):
        self.ws.close()
        self.reader.cancel()


class Page:
    """One tab of the browser, attached with a flat DevTools session."""

    def __init__(self, cdp, target, session):
        self.cdp, self.target, self.session = cdp, target, session

    @classmethod
    async def open(cls, cdp):
        t = await cdp.send("Target.createTarget", {"url": "about:blank"})
        a = await cdp.send("Target.attachToTarget", {"targetId": t["targetId"], "flatten": True})
        p = cls(cdp, t["targetId"], a["sessionId"])
        for domain in ("Page", "Runtime", "Log"):
            await p.send(domain + ".enable")
        await p.send("Page.addScriptToEvaluateOnNewDocument", {"source": EXPOSE_APP})
        await p.viewport(VIEW_HEIGHT)
        return p

    async def send(self, method, params=None, timeout=30):
        return await self.cdp.send(method, params, self.session, timeout)

    async def viewport(self, height):
        await self.send("Emulation.setDeviceMetricsOverride",
                        {"width": VIEW_WIDTH, "height": height, "deviceScaleFactor": 1, "mobile": False})

    async def eval(self, expr, timeout=30):
        r = await self.send("Runtime.evaluate",
                            {"expression": expr, "returnByValue": True, "awaitPromise": True}, timeout)
        if "exceptionDetails" in r:
            d = r["exceptionDetails"]
            desc = d.get("exception", {}).get("description") or d.get("text", "")
            raise DriverError("page script %s failed: %s" % (expr[:60], desc))
        return r.get("result", {}).get("value")

    def notes(self):
        """JavaScript exceptions and console/log errors of this tab so far."""
        exceptions, console = [], []
        for session, method, p in self.cdp.events:
            if session != self.session:
                continue
            if method == "Runtime.exceptionThrown":
                d = p.get("exceptionDetails", {})
                exceptions.append(d.get("exception", {}).get("description") or d.get("text", ""))
            elif method == "Runtime.consoleAPICalled" and p.get("type") in ("error", "assert"):
                console.append(" ".join(str(a.get("value", a.get("description", ""))) for a in p.get("args", [])))
            elif method == "Log.entryAdded" and p.get("entry", {}).get("level") == "error":
                e = p["entry"]
                console.append("%s: %s%s" % (e.get("source"), e.get("text"), " (%s)" % e["url"] if e.get("url") else ""))
        return exceptions, console

    async def close(self):
        try:
            await self.cdp.send("Target.closeTarget", {"targetId": self.target}, timeout=10)
        except DriverError:
            pass


async def poll(what, timeout, fn, interval=0.25):
    """Call async fn until it returns a true value; DriverError after timeout s."""
    deadline = time.monotonic() + timeout
    while True:
        v = await fn()
        if v:
            return v
        if time.monotonic() > deadline:
            raise DriverError("%s: not within %d s" % (what, timeout))
        await asyncio.sleep(interval)


def first_line(src):
    for line in (src or "").splitlines():
        line = line.strip()
        if line and line != "%%":
            return line[:60]
    return ""


async def run(args, res):
    try:
        cdp = await CDP.connect(args.devtools)
    except Exception as e:
        raise DriverError("connecting to Chromium's DevTools at %s: %s" % (args.devtools, e)) from None
    page = await Page.open(cdp)
    t0 = time.monotonic()
    where = args.url.split("?")[0]  # without the token
    try:
        nav = await page.send("Page.navigate", {"url": args.url})
        if nav.get("errorText"):
            raise LoadError("loading %s: %s" % (where, nav["errorText"]))

        async def ready_ui():
            try:
                if not await page.eval("document.readyState === 'complete'"):
                    return ""
                status = await page.eval(
                    "(performance.getEntriesByType('navigation')[0] || {}).responseStatus || 0")
                if status >= 400:
                    raise LoadError("loading %s: the server answered HTTP %d" % (where, status))
                if await page.eval("location.pathname.endsWith('/login')"):
                    raise LoadError("loading %s: the server asks for a login (a wrong token?)" % where)
                await page.eval(HELPERS)
                return await page.eval("window.__beamnote.ui()")
            except LoadError:
                raise
            except DriverError:
                return ""  # the page is still navigating

        try:
            res["ui"] = await poll("loading the notebook page", args.kernel_timeout, ready_ui)
        except LoadError:
            raise
        except DriverError:
            lab = await page.eval("!!document.getElementById('jupyter-config-data')")
            title = await page.eval("document.title")
            raise DriverError(
                "the page %s (title %r) shows no notebook within %d s: %s" % (
                    where, title, args.kernel_timeout,
                    "a Notebook 7/JupyterLab page whose window.jupyterapp never appeared"
                    if lab else "neither classic Notebook (window.Jupyter.notebook) nor Notebook 7/JupyterLab"))
        res["seconds"]["load"] = round(time.monotonic() - t0, 2)
        await page.eval("window.__beamnote.watch()")

        async def kernel_ready():
            k = await page.eval("window.__beamnote.kernel()")
            res["kernel"] = k
            return k["ready"] and k["status"] == "idle"

        t1 = time.monotonic()
        try:
            await poll("the kernel", args.kernel_timeout, kernel_ready)
        except DriverError:
            raise DriverError("the kernel is not connected and idle after %d s (kernel %r, status %r)" % (
                args.kernel_timeout, res["kernel"].get("name"), res["kernel"].get("status"))) from None
        res["seconds"]["kernel"] = round(time.monotonic() - t1, 2)

        t2 = time.monotonic()
        await page.eval("window.__beamnote.runAll()")
        stable = 0
        deadline = t2 + args.run_timeout
        exercised = set()
        while True:
            for lid in await page.eval("window.__beamnote.liveActive()"):
                if lid not in exercised:
                    exercised.add(lid)
                    res["live"].append(await exercise_live(page, lid, args))
            st = await page.eval("window.__beamnote.state()")
            res["kernel"] = st["kernel"]
            if st["events"]:
                raise DriverError("the kernel died or restarted while the cells ran (%s)" % ", ".join(st["events"]))
            stable = stable + 1 if not st["busy"] and st["kernel"]["status"] == "idle" else 0
            if stable >= 3:
                break
            if time.monotonic() > deadline:
                facts = await page.eval("window.__beamnote.facts('')")
                busy = ["cell %d (%s)" % (i, first_line(facts[i].get("source"))) for i in st["busy"]]
                raise DriverError(
                    "the cells did not finish within %d s (Run All; kernel status %r); still running: %s" % (
                        args.run_timeout, st["kernel"]["status"], "; ".join(busy) or "none, but the kernel is not idle"))
            await asyncio.sleep(0.5)
        res["seconds"]["run_all"] = round(time.monotonic() - t2, 2)
    finally:
        # Collect whatever the page shows, also after a failure.
        try:
            await page.eval(HELPERS)
            if await page.eval("window.__beamnote.ui()"):
                res["cells"] = await page.eval("window.__beamnote.facts(%s)" % json.dumps(args.figure_text))
                res["notebook"] = await page.eval("window.__beamnote.notebook()")
                await screenshot(page, args.screenshot, res)
                await page.eval("window.__beamnote.quiet()")
        except Exception as e:  # the primary error, if any, is reported instead
            res["warnings"].append("collecting the page's state: %s" % e)
        res["exceptions"], res["console"] = page.notes()
        await page.close()
        cdp.close()


async def exercise_live(page, lid, args):
    """Move every slider of the live controls lid, then press done.

    Per slider: single moves between positions at a quarter and three
    quarters of its range and its ends, each timed from the input event to
    the cell's figure showing the new value (the round trip: page, server,
    kernel, cell program drawing, and back); then a burst of input events
    over half the range in one go, as a fast drag sends, which must end at
    the burst's last value. Then done, and the cell must replace the
    controls with its end line.
    """
    rep = {"id": lid, "cell": await page.eval("window.__beamnote.cellIndex(%s)" % json.dumps(lid)),
           "sliders": await page.eval("window.__beamnote.liveSliders(%s)" % json.dumps(lid)),
           "moves": [], "bursts": [], "done": False, "ended": "", "error": ""}
    timeout_ms = int(args.move_timeout * 1000)
    for i, sl in enumerate(rep["sliders"]):
        n = sl["n"]
        ks = [n // 4, (3 * n) // 4, n // 4 + 1, (3 * n) // 4 - 1, 0, n] * args.live_rounds
        for k in ks:
            if k == sl["value"]:
                continue
            m = await page.eval("window.__beamnote.liveMove(%s, %d, [%d], %d)" % (json.dumps(lid), i, k, timeout_ms),
                                timeout=args.move_timeout + 10)
            m.update(slider=i, to=k)
            rep["moves"].append(m)
            sl["value"] = k
        burst = list(range(0, n // 2 + 1))
        m = await page.eval("window.__beamnote.liveMove(%s, %d, %s, %d)" % (json.dumps(lid), i, json.dumps(burst), timeout_ms),
                            timeout=args.move_timeout + 10)
        m.update(slider=i, moves=len(burst))
        rep["bursts"].append(m)
    # What the live controls look like (the first ones of the page), kept
    # beside the notebook's screenshot.
    if not args.live_shot_taken:
        args.live_shot_taken = True
        await page.eval("document.getElementById(%s).scrollIntoView({block: 'center'})" % json.dumps(lid))
        shot = await page.send("Page.captureScreenshot", {"format": "png"}, timeout=60)
        path = args.screenshot[:-4] + "-live.png" if args.screenshot.endswith(".png") else args.screenshot + "-live.png"
        with open(path, "wb") as f:
            f.write(base64.b64decode(shot["data"]))
        rep["screenshot"] = path
    rep["done"] = await page.eval("window.__beamnote.liveDone(%s)" % json.dumps(lid))

    async def ended():
        return await page.eval("window.__beamnote.liveEnded(%d)" % rep["cell"])

    try:
        rep["ended"] = await poll("the live cell's end after done", args.move_timeout, ended, interval=0.1)
    except DriverError as e:
        rep["error"] = str(e)
    return rep


async def screenshot(page, path, res):
    """Make the window as tall as the notebook, then capture it as PNG."""
    for _ in range(3):  # outputs (MathJax, images) may still change the height
        h = await page.eval("window.__beamnote.fullHeight()")
        h = max(VIEW_HEIGHT, min(h, MAX_SHOT_HEIGHT))
        await page.viewport(h)
        # Notebook 6 sizes its scrolling area on the window's resize event.
        await page.eval("window.dispatchEvent(new Event('resize')); "
                        "new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(() => setTimeout(r, 300))))")
        if await page.eval("window.__beamnote.overflow()") <= 1 or h == MAX_SHOT_HEIGHT:
            break
    if h == MAX_SHOT_HEIGHT and await page.eval("window.__beamnote.overflow()") > 1:
        res["warnings"].append("the notebook is taller than %d px; the screenshot is cut there" % MAX_SHOT_HEIGHT)
    shot = await page.send("Page.captureScreenshot", {"format": "png"}, timeout=60)
    with open(path, "wb") as f:
        f.write(base64.b64decode(shot["data"]))
    res["screenshot"] = {"path": path, "width": VIEW_WIDTH, "height": h}


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--devtools", required=True, help="the browser's DevTools websocket URL")
    ap.add_argument("--url", required=True, help="the notebook's URL, with ?token=")
    ap.add_argument("--screenshot", required=True, help="PNG file to write")
    ap.add_argument("--figure-text", default="", help="text that marks the figure looked for in each <svg>")
    ap.add_argument("--kernel-timeout", type=float, default=120, help="seconds for the page and kernel to be ready")
    ap.add_argument("--run-timeout", type=float, default=300, help="seconds for Run All to finish")
    ap.add_argument("--move-timeout", type=float, default=10, help="seconds for a slider move to show its figure")
    ap.add_argument("--live-rounds", type=int, default=2, help="rounds of single moves per slider of a live what-if")
    args = ap.parse_args()
    args.live_shot_taken = False
    res = {"error": "", "ui": "", "kernel": {}, "seconds": {}, "cells": [], "notebook": None, "live": [],
           "exceptions": [], "console": [], "warnings": [], "screenshot": None}
    try:
        asyncio.run(run(args, res))
    except Exception as e:
        res["error"] = str(e) or type(e).__name__
    json.dump(res, sys.stdout)
    sys.stdout.write("\n")
    return 1 if res["error"] else 0


if __name__ == "__main__":
    sys.exit(main())
