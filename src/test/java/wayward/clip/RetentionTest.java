package wayward.clip;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.time.Duration;
import java.time.Instant;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class RetentionTest {
    private static final Instant NOW = Instant.parse("2026-12-02T12:00:00Z");

    /** An event's three files of the given total size, last modified some days ago. */
    private static void event(Path dir, String name, int bytes, double daysAgo) throws Exception {
        Files.createDirectories(dir);
        FileTime t = FileTime.from(NOW.minus(Duration.ofMinutes((long) (daysAgo * 24 * 60))));
        for (String ext : new String[] {".mp4", ".jpg", ".json"}) {
            Path f = dir.resolve(name + ext);
            Files.write(f, new byte[ext.equals(".mp4") ? bytes - 200 : 100]);
            Files.setLastModifiedTime(f, t);
        }
    }

    @Test
    void deletesEventsOlderThanTheAgeLimitWithAllTheirFiles(@TempDir Path evidence) throws Exception {
        Path cam = evidence.resolve("gate");
        event(cam, "old", 1000, 40);
        event(cam, "recent", 1000, 2);
        Retention.Result r = Retention.sweep(evidence, Duration.ofDays(30), Long.MAX_VALUE, NOW);
        assertEquals(1, r.eventsDeleted());
        assertEquals(1000, r.bytesDeleted());
        assertFalse(Files.exists(cam.resolve("old.mp4")));
        assertFalse(Files.exists(cam.resolve("old.json")));
        assertTrue(Files.exists(cam.resolve("recent.mp4")));
    }

    @Test
    void keepsTheFolderWithinTheSizeOldestFirst(@TempDir Path evidence) throws Exception {
        event(evidence.resolve("a"), "e1", 1000, 5);
        event(evidence.resolve("b"), "e2", 1000, 4);
        event(evidence.resolve("a"), "e3", 1000, 3);
        event(evidence.resolve("b"), "e4", 1000, 1);
        Retention.Result r = Retention.sweep(evidence, Duration.ofDays(30), 2500, NOW);
        assertEquals(2, r.eventsDeleted(), "4000 bytes down to at most 2500: the two oldest go");
        assertEquals(2000, r.bytesKept());
        assertFalse(Files.exists(evidence.resolve("a/e1.mp4")));
        assertFalse(Files.exists(evidence.resolve("b/e2.mp4")));
        assertTrue(Files.exists(evidence.resolve("a/e3.mp4")));
        assertTrue(Files.exists(evidence.resolve("b/e4.mp4")));
    }

    @Test
    void leavesFilesBeingWrittenAlone(@TempDir Path evidence) throws Exception {
        Files.createDirectories(evidence.resolve("gate"));
        Path part = evidence.resolve("gate/x.mp4.part");
        Files.write(part, new byte[5000]);
        Files.setLastModifiedTime(part, FileTime.from(NOW.minus(Duration.ofDays(90))));
        Retention.sweep(evidence, Duration.ofDays(30), 10, NOW);
        assertTrue(Files.exists(part));
    }
}
