package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.read.ListAppender;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import org.slf4j.LoggerFactory;
import wayward.analysis.CameraPipeline;
import wayward.scene.Scene;
import wayward.scene.SceneGenerator;

/**
 * The still-frame gate ({@code [flow] skip_still}) on a rendered scene with a long still stretch (the detection
 * suite's s76: a tug parked 20 s in a noisy night picture, then crawling the wrong way; a forklift later): the
 * events are those of the flow run on every frame, to the frame, and most of the parked stretch is skipped.
 */
class StillGateReplayTest {
    private static final Pattern SKIPPED = Pattern.compile("flow skipped on (\\d+) of (\\d+) analysed frames");

    @Test
    @Timeout(value = 180, unit = TimeUnit.SECONDS)
    void skippingStillFramesChangesNoEvent(@TempDir Path dir) throws Exception {
        Scene scene = Scene.load(Path.of("test-streams/suite/tune/s76-parked-then-crawls.scene.toml"));
        Path video = dir.resolve("s76.mp4");
        new SceneGenerator(scene).write(video, dir.resolve("s76.truth.json"));
        List<String> off = new ArrayList<>();
        List<String> on = new ArrayList<>();
        String offLog = replay(dir, scene, video, false, off);
        String onLog = replay(dir, scene, video, true, on);
        // the scene's script: two wrong-way passages (the crawl, the forklift), each a start and an end
        assertEquals(4, off.size(), off.toString());
        assertEquals(off, on, "the same events, at the same stream times, with the gate on");
        assertTrue(!SKIPPED.matcher(offLog).find(), "no gate when it is off: " + offLog);
        Matcher m = SKIPPED.matcher(onLog);
        assertTrue(m.find(), onLog);
        int skipped = Integer.parseInt(m.group(1));
        int analysed = Integer.parseInt(m.group(2));
        // 20 s parked at 10 analysed frames a second, less the gate's 1 s warm-up and 2 s run-on: about 170
        assertTrue(skipped >= 120 && skipped < analysed, skipped + " of " + analysed + " skipped");
    }

    /**
     * Replays the video with the gate on or off; adds "kind phase zone stream_s" per event; returns what the
     * analysis logged (through a list appender on its logger: the log goes to the process's standard error).
     */
    private static String replay(Path dir, Scene scene, Path video, boolean skipStill, List<String> events)
            throws Exception {
        Logger logger = (Logger) LoggerFactory.getLogger(CameraPipeline.class);
        ListAppender<ILoggingEvent> lines = new ListAppender<>();
        lines.start();
        logger.addAppender(lines);
        try {
            replayInto(dir, scene, video, skipStill, events);
        } finally {
            logger.detachAppender(lines);
        }
        StringBuilder log = new StringBuilder();
        for (ILoggingEvent e : lines.list) {
            log.append(e.getFormattedMessage()).append('\n');
        }
        return log.toString();
    }

    private static void replayInto(Path dir, Scene scene, Path video, boolean skipStill, List<String> events)
            throws Exception {
        Path config = dir.resolve("site-" + skipStill + ".toml");
        Files.writeString(config, "[flow]\nskip_still = " + skipStill + "\n" + ReplayEndToEndTest.configFor(scene, video));
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int code = Main.execute(new String[] {"replay", "--config", config.toString(), "--input", video.toString()},
                new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(0, code, err.toString(StandardCharsets.UTF_8));
        for (String line : out.toString(StandardCharsets.UTF_8).split("\n")) {
            if (!line.isBlank()) {
                Map<String, Object> e = ReplayEndToEndTest.parse(line);
                events.add(e.get("kind") + " " + e.get("phase") + " " + e.get("zone") + " " + e.get("stream_s"));
            }
        }
    }
}
