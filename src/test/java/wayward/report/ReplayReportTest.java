package wayward.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.cli.Main;
import wayward.event.Event;

/**
 * The replay report on the demo scene: the movers file agrees with the events (a start lies at the first frame
 * where one mover qualifies under the zone's settings), the what-if run equals a full replay with the same
 * settings, and the plot has the series and the shaded event in it.
 */
@Timeout(value = 120, unit = TimeUnit.SECONDS)
class ReplayReportTest {
    private static List<String> replay(Path config, Path report) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        List<String> args = new ArrayList<>(List.of("replay", "--config", config.toString(), "--input",
                "test-streams/yard-lane.mp4"));
        if (report != null) {
            args.addAll(List.of("--report", report.toString()));
        }
        int rc = Main.execute(args.toArray(String[]::new), new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8));
        assertEquals(0, rc);
        return List.of(out.toString(StandardCharsets.UTF_8).split("\n"));
    }

    /** "zone phase stream_s" of event lines. */
    private static List<String> phases(List<String> jsonLines) {
        List<String> out = new ArrayList<>();
        for (String l : jsonLines) {
            if (l.startsWith("{")) {
                Event e = wayward.event.EventJson.parse(l.getBytes(StandardCharsets.UTF_8));
                out.add(e.zone() + " " + e.phase().jsonName() + " " + e.streamSeconds());
            }
        }
        return out;
    }

    @Test
    void reportMatchesTheEventsAndWhatIfEqualsAFullReplay(@TempDir Path dir) throws Exception {
        Path report = dir.resolve("report");
        List<String> events = replay(Path.of("conf/demo.toml"), report);
        Path csv = report.resolve("yard-mast-2-lane-2-out.csv");
        List<String> lines = Files.readAllLines(csv);
        assertEquals(ReplayReport.HEADER, lines.get(1));
        assertTrue(lines.size() > 250, "one row per analysed frame (10 a second for 26 s): " + lines.size());
        Files.readAllLines(report.resolve("events.jsonl")).forEach(l -> assertTrue(events.contains(l), l));

        // the start: the frame where one mover first had travelled 10 px against the heading (min_travel_px)
        // after being followed 0.5 s (hold_seconds), or 30 px (quick_travel_px), at 3+ samples of 16 px²
        double start = Double.parseDouble(phases(events).get(0).split(" ")[2]);
        List<String> movers = Files.readAllLines(report.resolve("yard-mast-2-lane-2-out.movers.csv"));
        assertEquals(ReplayReport.MOVER_HEADER, movers.get(0));
        double first = Double.NaN;
        for (String row : movers.subList(1, movers.size())) {
            String[] f = row.split(",");
            double t = Double.parseDouble(f[0]);
            boolean seen = f[2].equals("1");
            double age = Double.parseDouble(f[3]);
            double travel = Double.parseDouble(f[4]);
            int peak = Integer.parseInt(f[6]);
            if (seen && peak * 16 >= 48 && (travel >= 30 || (travel >= 20 && age >= 0.5 - 1e-6))) {
                first = t;
                break;
            }
        }
        assertEquals(first, start, 0.001, "the start is the first frame where one mover qualifies");
        // (event times are rounded to 1 ms in the record, the CSV keeps full precision)
        assertEquals("active", lines.stream().skip(2).filter(l -> Double.parseDouble(l.split(",")[0]) >= start - 0.001)
                .findFirst().orElseThrow().split(",")[9], "the row of the start shows the rule active");

        // what-if with other settings equals a full replay configured with them (the movers do not depend on
        // the rule's settings)
        List<Event> whatIf = WhatIf.run(report, Map.of("min_travel_px", 25.0, "hold_seconds", 0.2));
        List<String> fromWhatIf = new ArrayList<>();
        for (Event e : whatIf) {
            // the event record rounds stream time to 1 ms
            fromWhatIf.add(e.zone() + " " + e.phase().jsonName() + " " + Math.round(e.streamSeconds() * 1000) / 1000.0);
        }
        Path config = dir.resolve("other.toml");
        Files.writeString(config, Files.readString(Path.of("conf/demo.toml"))
                .replace("[[camera.zone]]", "[[camera.zone]]\nmin_travel_px = 25\nhold_seconds = 0.2")
                .replace("data_dir = \"../wayward-demo\"", "data_dir = \"" + dir.resolve("data") + "\"")
                .replace("\"../test-streams/", "\"" + Path.of("test-streams").toAbsolutePath() + "/"));
        List<String> full = phases(replay(config, null));
        assertEquals(full, fromWhatIf);
        assertTrue(full.size() >= 2);
        IllegalArgumentException wrongKey = org.junit.jupiter.api.Assertions.assertThrows(
                IllegalArgumentException.class, () -> WhatIf.run(report, Map.of("onset_level", 0.01)));
        assertTrue(wrongKey.getMessage().startsWith("onset_level applies to no zone of this report"),
                wrongKey.getMessage());

        // the plot: both series and the shaded event are drawn (pixel counts, not just a file)
        BufferedImage png = ImageIO.read(report.resolve("yard-mast-2-lane-2-out.png").toFile());
        int red = 0;
        int blue = 0;
        int shaded = 0;
        for (int y = 0; y < png.getHeight(); y++) {
            for (int x = 0; x < png.getWidth(); x++) {
                int rgb = png.getRGB(x, y);
                int r = (rgb >> 16) & 0xff;
                int g = (rgb >> 8) & 0xff;
                int b = rgb & 0xff;
                if (r > 180 && g < 90 && b < 90) {
                    red++;
                } else if (b > 180 && r < 90) {
                    blue++;
                } else if (r > 240 && g > 220 && b > 150 && b < 215) {
                    shaded++;
                }
            }
        }
        assertTrue(red > 100 && blue > 300 && shaded > 5000, "red " + red + " blue " + blue + " shaded " + shaded);
        assertTrue(Files.readString(report.resolve("index.html")).contains("yard-mast-2-lane-2-out.png"));
    }
}
