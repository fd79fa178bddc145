package e2e

import (
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"lagwright/handlers"
)

// phoneWidth is a common phone's viewport width in CSS pixels (a 390 px wide phone,
// common practice for phone layouts).
const phoneWidth = 390

// TestPhoneWidthNoSidewaysScroll opens every screen of an SI demo project and of a US
// project at a phone's width and requires that none scrolls sideways: the page is no
// wider than the viewport (wide tables scroll inside their own box). It also checks the
// skip link to the content.
func TestPhoneWidthNoSidewaysScroll(t *testing.T) {
	a := startApp(t, handlers.Config{})
	demo := a.newDemoProject(t)
	us := "/projects/" + strconv.FormatInt(a.newUSProject(t, "Phone check (US)"), 10)
	p := openBrowser(t, a)
	p.do("phone viewport", chromedp.EmulateViewport(phoneWidth, 900))

	p.open(demo)
	line := run(p, "first line link", attr(`[data-testid="line-row"] a`, "href"))
	pages := []string{"/", "/projects", "/projects/new", demo, demo + "/edit", demo + "/lines/new", line,
		line + "/compare", line + "/sheet", demo + "/schedule", demo + "/import", demo + "/costs", demo + "/economics",
		demo + "/delete", "/materials", "/materials/new", "/jackets", "/jackets/new",
		us, us + "/edit", us + "/lines/new"}
	for _, path := range pages {
		p.open(path)
		if vw := run(p, "viewport of "+path, chromedp.Evaluate[int](`window.innerWidth`)); vw != phoneWidth {
			t.Fatalf("%s: the viewport is %d px, want %d: the phone emulation did not hold", path, vw, phoneWidth)
		}
		w := run(p, "measure "+path, chromedp.Evaluate[int](`document.documentElement.scrollWidth`))
		if w > phoneWidth {
			wide := run(p, "widest element", chromedp.Evaluate[string](`(() => {
				const out = [];
				for (const el of document.querySelectorAll('body *')) {
					if (el.getBoundingClientRect().right > innerWidth + 1) out.push(el.tagName + '.' + el.className);
				}
				return out.slice(0, 3).join(' | ');
			})()`))
			t.Errorf("%s is %d px wide at a %d px viewport (sideways scroll): %s", path, w, phoneWidth, wide)
		}
	}
	p.open(demo)
	if href := run(p, "skip link", attr(`a.skip-link`, "href")); href != "#main" {
		t.Errorf("skip link points to %q, want #main", href)
	}
	if txt := p.text(`a.skip-link`); !strings.Contains(strings.ToLower(txt), "skip") {
		t.Errorf("skip link reads %q", txt)
	}
}
