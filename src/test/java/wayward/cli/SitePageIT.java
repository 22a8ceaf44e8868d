package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import tools.jackson.databind.JsonNode;
import tools.jackson.databind.ObjectMapper;
import wayward.delivery.Mosquitto;

/**
 * The site page ({@code /}) in a real browser (Debian's Chromium, headless, over the DevTools protocol:
 * {@link Chromium}) against the packaged service watching the demo scene with a token and clips on: the camera's
 * live thumbnail changes on screen, the demo's wrong-way event appears in the list without a reload, its clip
 * plays in the browser (a finite duration, as ffprobe measures it), and the event's own page shows both phases
 * and draws the mover's path over the snapshot. The screenshots are kept in target/site-page.png
 * (the site) and target/site-event.png (the event's page).
 */
class SitePageIT {
    private static final String TOKEN = "yard-site-token-3";
    /** Pixels of the thumbnail that must differ between two screenshots for "the picture moved" (from memory). */
    private static final int CHANGED_PIXELS = 200;

    @Test
    @Timeout(value = 150, unit = TimeUnit.SECONDS)
    void theSiteShowsLivePicturesAndNewEventsWithTheirClipAndPath(@TempDir Path dir) throws Exception {
        Files.writeString(dir.resolve("status.token"), TOKEN);
        int port = Mosquitto.freePort();
        // the demo scene as a camera, looping, clips on (a 2 s post-roll keeps the wait for the clip short)
        Path site = YardSite.looping(dir, "http = \"127.0.0.1:" + port + "\"", "token_file = \"status.token\"",
                "[clips]", "post_roll_seconds = 2");
        Process service = YardSite.startService(dir, site);
        Path shot = ProcessRunner.projectDir().resolve("target/site-page.png");
        try (Chromium page = Chromium.start(dir, 1000, 1400)) {
            page.navigate("http://127.0.0.1:" + port + "/?access_token=" + TOKEN);
            page.await("location.port + ' ' + document.readyState", Pattern.compile(port + " complete"), 30);
            // a mark on the page's window: a reload would drop it
            page.eval("window.siteMark = 'same page'");

            // (a) the thumbnail: the camera watching, in words, its zone drawn, and its picture changing on screen
            page.await("(document.querySelector('.camera[data-camera=\"yard-mast-2\"] .badges') || {textContent: ''})"
                    + ".textContent", Pattern.compile("\u25cf watching"), 40);
            assertEquals("1", page.eval("document.querySelectorAll('.camera svg polygon.zone-line').length"));
            assertEquals("0.31,0.98 0.69,0.98 0.58,0.1 0.42,0.1",
                    page.eval("document.querySelector('.camera svg polygon.zone-line').getAttribute('points')"));
            page.await("document.querySelector('.camera img.thumb').naturalWidth", Pattern.compile("[1-9]\\d*"), 30);
            assertTrue(page.eval("document.querySelector('.camera img.thumb').src").contains("access_token=" + TOKEN));
            int[] box = rect(page, "document.querySelector('.camera img.thumb')");
            BufferedImage first = page.screenshot(shot);
            int changed = 0;
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(30);
            while (changed < CHANGED_PIXELS && System.nanoTime() < deadline) {
                TimeUnit.MILLISECONDS.sleep(1000); // polling the live picture, not a synchronisation sleep
                changed = differing(first, page.screenshot(shot), box);
            }
            assertTrue(changed >= CHANGED_PIXELS, "the thumbnail changed in " + changed + " pixels");

            // (b) the demo's wrong-way event (the truck, about 12 s into the clip) appears without a reload
            Path log = dir.resolve("data/events.jsonl");
            Map<String, Object> start = YardSite.awaitRecord(log, "wrong_way", "start", 1, 60);
            String id = (String) start.get("id");
            String row = "document.querySelector('#events li[data-id=\"" + id + "\"]')";
            page.await("(" + row + " || {innerText: ''}).innerText", Pattern.compile(
                    "(?s)\u21c5 wrong way.*yard-mast-2 / lane-2-out.*"), 20);
            assertEquals("same page", page.eval("window.siteMark"), "the page was not reloaded");
            // and it was raised after the page was loaded: the list's poll brought it
            assertEquals("true", page.eval("Date.parse('" + start.get("at") + "') > performance.timeOrigin"),
                    "the event started after the page opened: " + start.get("at"));
            assertEquals("wrong_way", page.eval(row + ".dataset.kind"));
            assertTrue(page.eval(row + ".querySelector('img').getAttribute('src')")
                    .startsWith("/" + start.get("snapshot") + "?access_token=" + TOKEN));
            // the filters: another kind hides it, its own kind shows it
            page.eval("(() => { const k = document.getElementById('f-kind'); k.value = 'motion';"
                    + " k.dispatchEvent(new Event('change')); })()");
            assertEquals("true", page.eval(row + ".hidden"));
            page.eval("(() => { const k = document.getElementById('f-kind'); k.value = 'wrong_way';"
                    + " k.dispatchEvent(new Event('change')); })()");
            assertEquals("false", page.eval(row + ".hidden"));
            page.screenshot(shot);

            // (c) the event's end, then its clip (complete once the post-roll is written): the event page's video
            Map<String, Object> end = YardSite.awaitRecord(log, "wrong_way", "end", 1, 60);
            assertEquals(id, end.get("id"));
            page.eval("location.hash = '#event=" + id + "'");
            // HTML spec, HTMLMediaElement: duration is NaN until the metadata is loaded (readyState >= 1), then the
            // media's length in seconds
            String duration = page.await("(() => { const v = document.getElementById('event-clip');"
                    + " return v && v.readyState >= 1 ? v.duration : 'waiting'; })()",
                    Pattern.compile("\\d+(\\.\\d+)?"), 40);
            double seconds = Double.parseDouble(duration);
            assertTrue(seconds > 0 && Double.isFinite(seconds), duration);
            assertTrue(page.eval("document.getElementById('event-clip').currentSrc")
                    .contains("access_token=" + TOKEN));
            // the same file as ffprobe (FFmpeg, Debian) measures it, within a frame or two
            Path clip = dir.resolve("data").resolve((String) end.get("clip"));
            String probed = YardSite.command("ffprobe", "-v", "error", "-show_entries", "format=duration", "-of",
                    "default=noprint_wrappers=1:nokey=1", clip.toString());
            assertEquals(Double.parseDouble(probed), seconds, 0.1, "the browser's duration against ffprobe's");

            // (d) the event's page: both phases, and the mover's path over the snapshot
            assertEquals("same page", page.eval("window.siteMark"), "the event page opened without a reload");
            assertEquals("start end", page.eval("[...document.querySelectorAll('#event-phases tr[data-phase]')]"
                    + ".map(r => r.dataset.phase).join(' ')"));
            JsonNode path = moverPath(log, id);
            assertTrue(path.size() >= 2, "the record has a path: " + path);
            page.await("document.querySelectorAll('#event-path polyline').length", Pattern.compile("2"), 20);
            assertEquals(String.valueOf(path.size()),
                    page.eval("document.querySelector('#event-path polyline.path-line').points.numberOfItems"));
            // drawn where the picture is: the path's box on screen lies inside the snapshot's, and has a length
            int[] picture = rect(page, "document.querySelector('#event-picture img')");
            int[] drawn = rect(page, "document.querySelector('#event-path polyline.path-line')");
            assertTrue(drawn[2] > 0 || drawn[3] > 0, "the path has a size: " + java.util.Arrays.toString(drawn));
            assertTrue(drawn[0] >= picture[0] - 8 && drawn[1] >= picture[1] - 8
                    && drawn[0] + drawn[2] <= picture[0] + picture[2] + 8
                    && drawn[1] + drawn[3] <= picture[1] + picture[3] + 8,
                    "the path " + java.util.Arrays.toString(drawn) + " lies on the snapshot "
                            + java.util.Arrays.toString(picture));
            // its first point on screen, at its fractions of the picture: the snapshot's width, and its height above
            // the caption band the service draws below the picture (Snapshot.BAND_HEIGHT pixels)
            double x0 = path.get(0).get(0).asDouble();
            double y0 = path.get(0).get(1).asDouble();
            double natural = Double.parseDouble(page.eval("document.querySelector('#event-picture img').naturalHeight"));
            double pictureHeight = picture[3] * (natural - wayward.clip.Snapshot.BAND_HEIGHT) / natural;
            String[] ring = page.eval("(() => { const c = document.querySelector('#event-path circle')"
                    + ".getBoundingClientRect(); return [c.left + c.width / 2, c.top + c.height / 2].join(','); })()")
                    .split(",");
            assertEquals(picture[0] + x0 * picture[2], Double.parseDouble(ring[0]), 3.0, "the first point's x");
            assertEquals(picture[1] + y0 * pictureHeight, Double.parseDouble(ring[1]), 3.0, "the first point's y");
            // and its last point (the dot), far down the picture, where the band would show most
            JsonNode last = path.get(path.size() - 1);
            String[] dot = page.eval("(() => { const c = document.querySelector('#event-path circle:last-of-type')"
                    + ".getBoundingClientRect(); return [c.left + c.width / 2, c.top + c.height / 2].join(','); })()")
                    .split(",");
            assertEquals(picture[0] + last.get(0).asDouble() * picture[2], Double.parseDouble(dot[0]), 3.0,
                    "the last point's x");
            assertEquals(picture[1] + last.get(1).asDouble() * pictureHeight, Double.parseDouble(dot[1]), 3.0,
                    "the last point's y");
            page.screenshot(ProcessRunner.projectDir().resolve("target/site-event.png"));

            // (e) a mute set through the status server shows on the camera, in words, and in the events
            java.net.http.HttpResponse<String> muted = java.net.http.HttpClient.newHttpClient().send(
                    java.net.http.HttpRequest.newBuilder(java.net.URI.create("http://127.0.0.1:" + port + "/api/mutes"))
                            .header("Authorization", "Bearer " + TOKEN).POST(java.net.http.HttpRequest.BodyPublishers
                                    .ofString("{\"camera\": \"yard-mast-2\", \"minutes\": 20, "
                                            + "\"reason\": \"mast repainted\"}")).build(),
                    java.net.http.HttpResponse.BodyHandlers.ofString());
            assertEquals(201, muted.statusCode(), muted.body());
            page.eval("location.hash = ''");
            page.await("(document.querySelector('.camera[data-camera=\"yard-mast-2\"] .badges') || {textContent: ''})"
                    + ".textContent", Pattern.compile("(?s).*\u2298 muted until .* by status \\(mast repainted\\).*"), 20);
            page.await("document.body.innerText", Pattern.compile("(?s).*camera muted.*"), 20);
        } finally {
            service.destroy();
            service.waitFor(20, TimeUnit.SECONDS);
        }
    }

    /** The mover's path of the event's end (the page draws the latest), or of its start. */
    private static JsonNode moverPath(Path log, String id) throws Exception {
        JsonNode found = null;
        for (String line : Files.readAllLines(log, StandardCharsets.UTF_8)) {
            JsonNode r = new ObjectMapper().readTree(line);
            if (id.equals(r.path("id").asString()) && r.has("mover_path")
                    && (found == null || "end".equals(r.path("phase").asString()))) {
                found = r.get("mover_path");
            }
        }
        assertTrue(found != null, "no mover_path in the records of " + id);
        return found;
    }

    /** An element's box on screen, CSS pixels rounded: left, top, width, height. */
    private static int[] rect(Chromium page, String element) throws Exception {
        String[] r = page.eval("(() => { const r = " + element + ".getBoundingClientRect();"
                + " return [r.left, r.top, r.width, r.height].map(Math.round).join(','); })()").split(",");
        return new int[] {Integer.parseInt(r[0]), Integer.parseInt(r[1]), Integer.parseInt(r[2]),
            Integer.parseInt(r[3])};
    }

    /** Pixels inside the box that differ (any channel by more than 24 levels) between two screenshots. */
    private static int differing(BufferedImage a, BufferedImage b, int[] box) {
        int n = 0;
        for (int y = Math.max(0, box[1]); y < Math.min(a.getHeight(), box[1] + box[3]); y++) {
            for (int x = Math.max(0, box[0]); x < Math.min(a.getWidth(), box[0] + box[2]); x++) {
                int p = a.getRGB(x, y);
                int q = b.getRGB(x, y);
                for (int shift = 0; shift <= 16; shift += 8) {
                    if (Math.abs(((p >> shift) & 0xff) - ((q >> shift) & 0xff)) > 24) {
                        n++;
                        break;
                    }
                }
            }
        }
        return n;
    }
}
