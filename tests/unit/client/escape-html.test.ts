import { describe, expect, it } from "vitest";
import { buildChartOption, formatResponseTooltip } from "@/components/charts/response-chart-option";
import { escapeHtml } from "@/lib/escape-html";

// Issue 10 ("Trust"), item 5: series names come from people (measured responses are named after the uploaded file),
// and ECharts puts a formatter's string into the tooltip as HTML, so every such name is escaped first.

const HOSTILE = ['<svg onload=alert(1)>', '<img src=x onerror=alert(1)>', '"><script>alert(1)</script>', "a & b < c > d ' e \" f"];

describe("escapeHtml", () => {
  it("escapes the five characters that matter in HTML text and attributes", () => {
    expect(escapeHtml(`<a href="x" title='y'>&amp;</a>`)).toBe("&lt;a href=&quot;x&quot; title=&#39;y&#39;&gt;&amp;amp;&lt;/a&gt;");
  });

  it("leaves ordinary names as they are and turns non-strings into text", () => {
    expect(escapeHtml("|S21| unit 7 — 25 °C, Ω")).toBe("|S21| unit 7 — 25 °C, Ω");
    expect(escapeHtml(42)).toBe("42");
    expect(escapeHtml(undefined)).toBe("");
    expect(escapeHtml(null)).toBe("");
  });

  it("leaves no tag or attribute quote in hostile names", () => {
    for (const name of HOSTILE) {
      const out = escapeHtml(name);
      expect(out).not.toMatch(/[<>"']/);
      expect(out.replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, "&")).toBe(name);
    }
  });
});

describe("response chart tooltip", () => {
  const marker = '<span style="background-color:#5b9bd5"></span>';

  it("escapes series names and keeps ECharts' own marker HTML", () => {
    const html = formatResponseTooltip([
      { seriesId: "line-0", seriesName: "|S21| nominal", marker, value: [1e8, -3.0103] },
      { seriesId: "line-1", seriesName: "|S21| <svg onload=alert(1)>", marker, value: [1e8, -2.5] },
      { seriesId: "line-2", seriesName: "|S21| <img src=x onerror=alert(1)>", marker, value: [1e8, -2.25] },
    ]);
    expect(html).toBe([
      "100 MHz",
      `${marker} |S21| nominal: -3.01`,
      `${marker} |S21| &lt;svg onload=alert(1)&gt;: -2.50`,
      `${marker} |S21| &lt;img src=x onerror=alert(1)&gt;: -2.25`,
    ].join("<br/>"));
    expect(html).not.toMatch(/<svg|<img/);
  });

  it("is the formatter the chart option uses", () => {
    const option = buildChartOption({ title: "t", series: [{ name: "<img src=x onerror=alert(1)>.s2p", x: [1e6, 1e7], y: [-1, -2] }] });
    const formatter = option.tooltip.formatter as typeof formatResponseTooltip;
    const html = formatter([{ seriesId: "line-0", seriesName: option.legend.data[0], marker, value: [1e7, -2] }]);
    expect(html).toContain("&lt;img src=x onerror=alert(1)&gt;.s2p: -2.00");
    expect(html).not.toContain("<img");
  });

  it("skips bands, masks and gaps", () => {
    expect(formatResponseTooltip([{ seriesId: "band-0-lo", seriesName: "<b>", marker, value: [1e6, 1] }, { seriesId: "line-0", seriesName: "x", marker, value: [1e6, null] }])).toBe("");
  });
});
