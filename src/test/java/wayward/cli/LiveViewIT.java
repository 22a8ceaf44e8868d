package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.delivery.Mosquitto;

/**
 * The live-view page in a real browser: Debian's Chromium, headless, driven over the Chrome DevTools Protocol
 * (Input.dispatchMouseEvent for the clicks and the drag, Runtime.evaluate to read the page, Page.captureScreenshot)
 * through the JDK's WebSocket client. The page shows the camera's picture, a zone drawn with simulated mouse
 * events gives the expected TOML snippet, and its live chart gets measurements. The screenshot is kept in
 * target/live-view.png.
 */
class LiveViewIT {
    private static final String TOKEN = "yard-view-token-7";

    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void aZoneDrawnWithTheMouseGivesItsTomlAndTheChartMoves(@TempDir Path dir) throws Exception {
        Files.writeString(dir.resolve("status.token"), TOKEN);
        int port = Mosquitto.freePort();
        Path site = YardSite.looping(dir, "http = \"127.0.0.1:" + port + "\"", "token_file = \"status.token\"",
                "[clips]", "enabled = false");
        Process service = YardSite.startService(dir, site);
        try (Chromium cdp = Chromium.start(dir, 1400, 900)) {
            // the site page: one camera with one zone, in the singular, its one stream's size (the demo clip is
            // 640x360, ffprobe) and "watching" for a camera that is watching (SitePageIT checks the rest of it)
            cdp.navigate("http://127.0.0.1:" + port + "/?access_token=" + TOKEN);
            cdp.await("(document.querySelector('.camera[data-camera=\"yard-mast-2\"] .facts') || {textContent: ''})"
                    + ".textContent", Pattern.compile("1 zone \u00b7 640x360 analysed"), 30);
            // a camera opening reads lost until its first analysed frame: waited for, not read once
            cdp.await("document.querySelector('.camera .badges').textContent", Pattern.compile("\u25cf watching"), 30);
            cdp.navigate("http://127.0.0.1:" + port + "/view/yard-mast-2?access_token=" + TOKEN);
            // the live picture arrived (the MJPEG stream's first frame gives the image its size)
            cdp.await("(document.getElementById('picture') || {naturalWidth: 0}).naturalWidth", Pattern.compile("[1-9]\\d*"), 60);

            // the streams line above the picture is filled by the page's first poll; the page keeps its room, and
            // the drawing is measured after it came (in CI a measurement before it put every click 0.1 too high)
            cdp.await("document.getElementById('streams').textContent", Pattern.compile(".*analysed.*"), 30);
            double[] r = stableRect(cdp);
            double left = r[0];
            double top = r[1];
            double width = r[2];
            double height = r[3];
            assertTrue(width > 300 && height > 150, java.util.Arrays.toString(r));
            double[][] corners = {{0.20, 0.90}, {0.80, 0.90}, {0.60, 0.20}, {0.40, 0.20}};
            for (double[] c : corners) {
                cdp.click(left + c[0] * width, top + c[1] * height);
            }
            cdp.click(left + 0.20 * width, top + 0.90 * height); // the first corner again closes the zone
            // drag up and to the right at 45°: the permitted heading
            double cx = left + 0.5 * width;
            double cy = top + 0.6 * height;
            cdp.mouse("mousePressed", cx, cy, 1);
            cdp.mouse("mouseMoved", cx + 30, cy - 30, 1);
            cdp.mouse("mouseMoved", cx + 60, cy - 60, 1);
            cdp.mouse("mouseReleased", cx + 60, cy - 60, 0);

            String snippet = cdp.eval("window.waywardSnippet()");
            assertEquals(String.join("\n", "[[camera.zone]]", "id = \"new-zone\"",
                    "polygon = [[0.20, 0.90], [0.80, 0.90], [0.60, 0.20], [0.40, 0.20]]", "heading_deg = 45", ""),
                    snippet);
            // the chart gets measurements of the drawn zone from /api/measure
            cdp.await("series.filter(s => s.moving_share !== null).length >= 3", Pattern.compile("true"), 20);

            // a configured zone, moved: its first corner dragged from (0.31, 0.98) to (0.25, 0.95)
            cdp.await("document.getElementById('existing').options.length", Pattern.compile("2"), 20);
            cdp.eval("(() => { const s = document.getElementById('existing'); s.value = 'lane-2-out';"
                    + " document.getElementById('edit').click(); return s.value; })()");
            // measured again: the text above the picture (the streams line) may have changed its height meanwhile
            r = stableRect(cdp);
            left = r[0];
            top = r[1];
            width = r[2];
            height = r[3];
            cdp.mouse("mousePressed", left + 0.31 * width, top + 0.98 * height, 1);
            cdp.mouse("mouseMoved", left + 0.28 * width, top + 0.965 * height, 1);
            cdp.mouse("mouseMoved", left + 0.25 * width, top + 0.95 * height, 1);
            cdp.mouse("mouseReleased", left + 0.25 * width, top + 0.95 * height, 0);
            assertEquals(String.join("\n", "[[camera.zone]]", "id = \"lane-2-out\"",
                    "polygon = [[0.25, 0.95], [0.69, 0.98], [0.58, 0.10], [0.42, 0.10]]", "heading_deg = 0", ""),
                    cdp.eval("window.waywardSnippet()"));

            // the drawn zone, read from the drawing surface itself: there, and black and white only (every hue
            // is a direction on the colour wheel)
            String drawn = cdp.eval("(() => { const c = document.getElementById('draw');"
                    + " const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;"
                    + " let opaque = 0, hued = 0; for (let i = 0; i < d.length; i += 4) { if (d[i + 3] < 200) continue;"
                    + " opaque++; if (Math.max(d[i], d[i + 1], d[i + 2]) - Math.min(d[i], d[i + 1], d[i + 2]) > 30) hued++; }"
                    + " return opaque + ' ' + hued; })()");
            String[] counts = drawn.split(" ");
            assertTrue(Integer.parseInt(counts[0]) > 400, "the drawn zone shows: " + drawn);
            assertEquals("0", counts[1], "hued pixels of the drawn zone (opaque, hued): " + drawn);
            // the flow arrows, within the picture (the page's colour legend lies beside it). The demo clip has still
            // stretches of seconds (between the tug and the truck, after the van): screenshots are taken until one
            // shows arrows, for up to 40 s (the clip loops every 26 s)
            int coloured = 0;
            long arrowsDeadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(40);
            while (coloured <= 50 && System.nanoTime() < arrowsDeadline) {
                BufferedImage img = cdp.screenshot(ProcessRunner.projectDir().resolve("target/live-view.png"));
                coloured = colouredSamples(img, left, top, width, height);
                if (coloured <= 50) {
                    TimeUnit.MILLISECONDS.sleep(500); // polling the live picture, not a synchronisation sleep
                }
            }
            assertTrue(coloured > 50, "flow arrows show: " + coloured + " coloured samples");
            // the colour legend beside the picture has arrived and is the wheel (WheelLegendTest checks its pixels)
            assertEquals("65", cdp.eval("document.getElementById('wheel').naturalWidth"));

            // the page mutes a zone (POST with the page's token in the Authorization header), shows it, and ends it
            cdp.eval("(() => { document.getElementById('mute-what').value = 'lane-2-out';"
                    + " document.getElementById('mute-minutes').value = '15';"
                    + " document.getElementById('mute-reason').value = 'forklift reversing';"
                    + " document.getElementById('mute').click(); return 1; })()");
            cdp.await("document.getElementById('mute-said').textContent", Pattern.compile("Muted\\."), 20);
            cdp.await("document.getElementById('mute-state').textContent",
                    Pattern.compile("Muted: zone lane-2-out until .* by status \\(forklift reversing\\)\\."), 20);
            Map<String, Object> muted = YardSite.awaitRecord(dir.resolve("data/events.jsonl"), "zone_muted", "start",
                    1, 20);
            assertEquals("forklift reversing", muted.get("reason"));
            cdp.eval("(() => { document.getElementById('mute-said').textContent = '';"
                    + " document.getElementById('unmute').click(); return 1; })()");
            cdp.await("document.getElementById('mute-said').textContent", Pattern.compile("Mute ended\\."), 20);
            cdp.await("document.getElementById('mute-state').textContent", Pattern.compile("Muted: nothing\\."), 20);
        } finally {
            service.destroy();
            service.waitFor(20, TimeUnit.SECONDS);
        }
    }

    /**
     * The drawing surface's box on screen (left, top, width, height). The page lays it out again once the
     * picture's size is known: measured until two readings 200 ms apart agree (once measured mid-layout, every
     * click landed at half its place).
     */
    private static double[] stableRect(Chromium cdp) throws Exception {
        String measure = "(() => { const r = document.getElementById('draw').getBoundingClientRect();"
                + " return [r.left, r.top, r.width, r.height].join(','); })()";
        String rect = cdp.eval(measure);
        for (int i = 0; i < 25; i++) {
            TimeUnit.MILLISECONDS.sleep(200); // polling the layout, not a synchronisation sleep
            String again = cdp.eval(measure);
            if (again.equals(rect)) {
                break;
            }
            rect = again;
        }
        String[] r = rect.split(",");
        return new double[] {Double.parseDouble(r[0]), Double.parseDouble(r[1]), Double.parseDouble(r[2]),
            Double.parseDouble(r[3])};
    }

    /** Samples (every 2nd pixel each way) inside the picture's box whose colour is far from grey. */
    private static int colouredSamples(BufferedImage img, double left, double top, double width, double height) {
        int coloured = 0;
        for (int y = (int) top; y < Math.min(img.getHeight(), top + height); y += 2) {
            for (int x = (int) left; x < Math.min(img.getWidth(), left + width); x += 2) {
                int rgb = img.getRGB(x, y);
                int red = (rgb >> 16) & 0xff;
                int green = (rgb >> 8) & 0xff;
                int blue = rgb & 0xff;
                if (Math.max(red, Math.max(green, blue)) - Math.min(red, Math.min(green, blue)) > 60) {
                    coloured++;
                }
            }
        }
        return coloured;
    }
}
