package render

import (
	"bufio"
	"bytes"
	"encoding/base64"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"bivar/render/internal/fixture"
	"bivar/themes"
)

// The browser test opens report.html in headless Chromium over the
// DevTools protocol (--remote-debugging-pipe: JSON messages separated by
// NUL on file descriptors 3 and 4), records every network request, console
// message, log entry and exception, then takes a full-page screenshot and
// prints to PDF. It fails on any request other than the page itself and on
// any error or warning the browser reports (a blocked load, a CSP
// violation, a script error).

const chromiumPath = "/usr/bin/chromium"

type cdp struct {
	t       *testing.T
	in      *os.File // we write commands here (browser's fd 3)
	out     *bufio.Reader
	mu      sync.Mutex
	nextID  int
	replies map[int]chan json.RawMessage
	events  chan cdpMsg
}

type cdpMsg struct {
	ID        int             `json:"id"`
	Method    string          `json:"method"`
	Params    json.RawMessage `json:"params"`
	Result    json.RawMessage `json:"result"`
	Error     json.RawMessage `json:"error"`
	SessionID string          `json:"sessionId"`
}

func startChromium(t *testing.T) (*cdp, func()) {
	t.Helper()
	if _, err := os.Stat(chromiumPath); err != nil {
		t.Skipf("browser test skipped: %s not found (Debian's chromium package; .ci/run installs it)", chromiumPath)
	}
	cmdR, cmdW, err := os.Pipe() // browser reads commands from fd 3
	if err != nil {
		t.Fatal(err)
	}
	evR, evW, err := os.Pipe() // browser writes to fd 4
	if err != nil {
		t.Fatal(err)
	}
	profile := t.TempDir()
	cmd := exec.Command(chromiumPath, "--headless", "--no-sandbox", "--disable-gpu",
		"--disable-background-networking", "--disable-component-update", "--disable-sync",
		"--no-first-run", "--user-data-dir="+profile, "--remote-debugging-pipe",
		"--hide-scrollbars", "--window-size=1100,1400", "about:blank")
	cmd.ExtraFiles = []*os.File{cmdR, evW}
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	if err := cmd.Start(); err != nil {
		t.Fatalf("starting %s: %v", chromiumPath, err)
	}
	cmdR.Close()
	evW.Close()
	c := &cdp{t: t, in: cmdW, out: bufio.NewReader(evR), replies: map[int]chan json.RawMessage{}, events: make(chan cdpMsg, 4096)}
	go c.read()
	stop := func() {
		cmdW.Close()
		done := make(chan struct{})
		go func() { cmd.Wait(); close(done) }()
		select {
		case <-done:
		case <-time.After(10 * time.Second):
			cmd.Process.Kill()
			<-done
		}
		evR.Close()
	}
	return c, stop
}

func (c *cdp) read() {
	for {
		b, err := c.out.ReadBytes(0)
		if err != nil {
			close(c.events)
			return
		}
		var m cdpMsg
		if json.Unmarshal(b[:len(b)-1], &m) != nil {
			continue
		}
		if m.ID != 0 {
			c.mu.Lock()
			ch := c.replies[m.ID]
			c.mu.Unlock()
			if ch != nil {
				if len(m.Error) > 0 {
					ch <- append(json.RawMessage(`{"__error":`), append(m.Error, '}')...)
				} else {
					ch <- m.Result
				}
			}
			continue
		}
		c.events <- m
	}
}

func (c *cdp) call(session, method string, params any) (json.RawMessage, error) {
	c.mu.Lock()
	c.nextID++
	id := c.nextID
	ch := make(chan json.RawMessage, 1)
	c.replies[id] = ch
	c.mu.Unlock()
	msg := map[string]any{"id": id, "method": method, "params": params}
	if session != "" {
		msg["sessionId"] = session
	}
	b, _ := json.Marshal(msg)
	if _, err := c.in.Write(append(b, 0)); err != nil {
		return nil, err
	}
	select {
	case r := <-ch:
		if bytes.HasPrefix(r, []byte(`{"__error":`)) {
			return nil, fmt.Errorf("%s: %s", method, r)
		}
		return r, nil
	case <-time.After(60 * time.Second):
		return nil, fmt.Errorf("%s: no answer from the browser in 60 s", method)
	}
}

// pageProblems loads file in a fresh tab and returns what went wrong, the
// PNG screenshot and the PDF.
func pageProblems(t *testing.T, c *cdp, file string) (problems []string, png, pdf []byte) {
	problems, png, pdf, _ = pageProblemsPrint(t, c, file)
	return problems, png, pdf
}

// pageProblemsPrint is pageProblems that also returns a screenshot with
// print media emulated, to look at the print styles.
func pageProblemsPrint(t *testing.T, c *cdp, file string) (problems []string, png, pdf, printPNG []byte) {
	t.Helper()
	url := "file://" + file
	res, err := c.call("", "Target.createTarget", map[string]any{"url": "about:blank"})
	if err != nil {
		t.Fatal(err)
	}
	var tgt struct{ TargetID string }
	json.Unmarshal(res, &tgt)
	res, err = c.call("", "Target.attachToTarget", map[string]any{"targetId": tgt.TargetID, "flatten": true})
	if err != nil {
		t.Fatal(err)
	}
	var att struct{ SessionID string }
	json.Unmarshal(res, &att)
	s := att.SessionID
	for _, m := range []string{"Page.enable", "Network.enable", "Runtime.enable", "Log.enable"} {
		if _, err := c.call(s, m, map[string]any{}); err != nil {
			t.Fatal(err)
		}
	}
	if _, err := c.call(s, "Emulation.setDeviceMetricsOverride", map[string]any{"width": 1100, "height": 1400, "deviceScaleFactor": 1, "mobile": false}); err != nil {
		t.Fatal(err)
	}
	if _, err := c.call(s, "Page.navigate", map[string]any{"url": url}); err != nil {
		t.Fatal(err)
	}
	deadline := time.After(60 * time.Second)
	loaded := false
	collect := func(m cdpMsg) {
		if m.SessionID != s {
			return
		}
		switch m.Method {
		case "Page.loadEventFired":
			loaded = true
		case "Network.requestWillBeSent":
			var p struct{ Request struct{ URL string } }
			json.Unmarshal(m.Params, &p)
			if p.Request.URL != url {
				problems = append(problems, "network request: "+p.Request.URL)
			}
		case "Runtime.consoleAPICalled":
			problems = append(problems, "console: "+string(m.Params))
		case "Runtime.exceptionThrown":
			problems = append(problems, "exception: "+string(m.Params))
		case "Log.entryAdded":
			var p struct {
				Entry struct{ Level, Source, Text, URL string }
			}
			json.Unmarshal(m.Params, &p)
			if p.Entry.Level == "error" || p.Entry.Level == "warning" {
				problems = append(problems, fmt.Sprintf("log %s (%s): %s %s", p.Entry.Level, p.Entry.Source, p.Entry.Text, p.Entry.URL))
			}
		}
	}
	for !loaded {
		select {
		case m, ok := <-c.events:
			if !ok {
				t.Fatal("the browser closed the connection")
			}
			collect(m)
		case <-deadline:
			t.Fatalf("%s: no load event within 60 s", file)
		}
	}
	// Let late messages (CSP reports, lazy loads) arrive.
	quiet := time.After(700 * time.Millisecond)
	for wait := true; wait; {
		select {
		case m, ok := <-c.events:
			if ok {
				collect(m)
			}
		case <-quiet:
			wait = false
		}
	}
	problems = append(problems, layoutProblems(t, c, s)...)
	res, err = c.call(s, "Page.captureScreenshot", map[string]any{"format": "png", "captureBeyondViewport": true})
	if err != nil {
		t.Fatal(err)
	}
	var shot struct{ Data string }
	json.Unmarshal(res, &shot)
	png, _ = base64.StdEncoding.DecodeString(shot.Data)
	res, err = c.call(s, "Page.printToPDF", map[string]any{"preferCSSPageSize": true, "printBackground": true})
	if err != nil {
		t.Fatal(err)
	}
	var doc struct{ Data string }
	json.Unmarshal(res, &doc)
	pdf, _ = base64.StdEncoding.DecodeString(doc.Data)
	for wait := true; wait; { // messages raised while printing
		select {
		case m, ok := <-c.events:
			if ok {
				collect(m)
			}
		case <-time.After(300 * time.Millisecond):
			wait = false
		}
	}
	if _, err := c.call(s, "Emulation.setEmulatedMedia", map[string]any{"media": "print"}); err == nil {
		// The print styles on the width of an A4 page inside its margins
		// (210 mm − 2 × 14 mm = 182 mm, 688 CSS px); Letter is wider.
		if _, err := c.call(s, "Emulation.setDeviceMetricsOverride", map[string]any{"width": 688, "height": 1400, "deviceScaleFactor": 1, "mobile": false}); err == nil {
			for _, p := range layoutProblems(t, c, s) {
				problems = append(problems, "printed: "+p)
			}
		}
		if res, err := c.call(s, "Page.captureScreenshot", map[string]any{"format": "png", "captureBeyondViewport": true}); err == nil {
			var ps struct{ Data string }
			json.Unmarshal(res, &ps)
			printPNG, _ = base64.StdEncoding.DecodeString(ps.Data)
		}
	}
	c.call("", "Target.closeTarget", map[string]any{"targetId": tgt.TargetID})
	return problems, png, pdf, printPNG
}

// summaryLayout measures the summary table in the page as laid out: how
// far it overflows its box (a horizontal scrollbar), and which verdict or
// number cells broke their first word over two lines ("curve d").
const summaryLayout = `(() => {
  const out = [];
  for (const t of document.querySelectorAll('.summary-table')) {
    const box = t.parentElement;
    if (box.scrollWidth > box.clientWidth + 1) out.push('summary overflows by ' + (box.scrollWidth - box.clientWidth) + ' px');
    for (const td of t.querySelectorAll('td.word, td.n')) {
      const n = td.firstChild;
      if (!n || n.nodeType !== 3 || !n.textContent.trim()) continue;
      const r = document.createRange();
      r.selectNodeContents(n);
      if (r.getClientRects().length > 1) out.push('summary cell "' + n.textContent + '" wraps');
    }
  }
  return JSON.stringify(out);
})()`

// layoutProblems runs summaryLayout in the page through DevTools (the
// page's own CSP forbids scripts; DevTools evaluation is not a page script).
func layoutProblems(t *testing.T, c *cdp, session string) []string {
	t.Helper()
	res, err := c.call(session, "Runtime.evaluate", map[string]any{"expression": summaryLayout, "returnByValue": true})
	if err != nil {
		t.Fatalf("measuring the summary: %v", err)
	}
	var v struct {
		Result struct{ Value string }
	}
	json.Unmarshal(res, &v)
	var out []string
	if err := json.Unmarshal([]byte(v.Result.Value), &out); err != nil {
		t.Fatalf("measuring the summary gave %s: %v", res, err)
	}
	return out
}

func TestBrowser(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test skipped in -short mode")
	}
	c, stop := startChromium(t)
	defer stop()
	dir := t.TempDir()
	keep := os.Getenv("BIVAR_BROWSER_OUT") // set to a folder to keep the PNG and PDF for a look

	// The test must be able to fail: a page that loads an image and logs
	// to the console has to be caught.
	bad := filepath.Join(dir, "bad.html")
	os.WriteFile(bad, []byte(`<!DOCTYPE html><html><body><img src="http://127.0.0.1:9/x.png"><p>x</p></body></html>`), 0o644)
	if problems, _, _ := pageProblems(t, c, bad); len(problems) == 0 {
		t.Fatal("a page loading http://127.0.0.1:9/x.png gave no problem: the browser check is blind")
	}

	for _, th := range themes.Names() {
		for _, hostile := range []bool{false, true} {
			name := th
			if hostile {
				name += "-hostile"
			}
			t.Run(name, func(t *testing.T) {
				out := filepath.Join(dir, name)
				r := fixture.Report(fixture.Options{Hostile: hostile})
				if err := WriteReport(out, r, []string{"html"}, WithTheme(th)); err != nil {
					t.Fatal(err)
				}
				problems, png, pdf, printPNG := pageProblemsPrint(t, c, filepath.Join(out, HTMLFile))
				for _, p := range problems {
					t.Error(p)
				}
				if !bytes.HasPrefix(png, []byte("\x89PNG")) || len(png) < 10000 {
					t.Errorf("screenshot is not a PNG or is nearly empty (%d bytes)", len(png))
				}
				if !bytes.HasPrefix(pdf, []byte("%PDF-")) {
					t.Errorf("print to PDF gave no PDF (%d bytes)", len(pdf))
				}
				// One page per study at least: studies start on a new page.
				if pages := bytes.Count(pdf, []byte("/Type /Page\n")) + bytes.Count(pdf, []byte("/Type /Page ")) + bytes.Count(pdf, []byte("/Type/Page")); pages > 0 && pages < len(r.Studies)+1 {
					t.Errorf("PDF has %d pages, want at least %d (summary, then one page per study)", pages, len(r.Studies)+1)
				}
				if keep != "" {
					os.MkdirAll(keep, 0o755)
					os.WriteFile(filepath.Join(keep, name+".png"), png, 0o644)
					os.WriteFile(filepath.Join(keep, name+".pdf"), pdf, 0o644)
					os.WriteFile(filepath.Join(keep, name+"-print.png"), printPNG, 0o644)
				}
			})
		}
	}
	_ = strings.Contains
}
