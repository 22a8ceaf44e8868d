package wayward.clip;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.time.Duration;
import java.time.Instant;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import wayward.delivery.LogCapture;

/** A data folder of an older version keeps its evidence in clips/: it moves to evidence/ and retention finds it. */
class EvidenceFolderTest {
    private static final Instant NOW = Instant.parse("2026-12-03T12:00:00Z");

    private static Path oldEvent(Path folder, double daysAgo) throws Exception {
        Path cam = Files.createDirectories(folder.resolve("gate"));
        FileTime t = FileTime.from(NOW.minus(Duration.ofMinutes((long) (daysAgo * 24 * 60))));
        for (String ext : new String[] {".mp4", ".jpg", ".json"}) {
            Files.write(cam.resolve("e1" + ext), new byte[100]);
            Files.setLastModifiedTime(cam.resolve("e1" + ext), t);
        }
        return cam.resolve("e1.mp4");
    }

    @Test
    void anOldClipsFolderIsRenamedOnceAndRetentionStillSweepsItsFiles(@TempDir Path data) throws Exception {
        oldEvent(data.resolve("clips"), 40);
        Path evidence;
        try (LogCapture log = new LogCapture(EvidenceFolder.class)) {
            evidence = EvidenceFolder.upgrade(data);
            assertEquals(List.of("INFO evidence: renamed " + data.resolve("clips") + " to " + data.resolve("evidence")
                    + " (the folder's new name); its files are kept and swept as before"), log.lines());
        }
        assertEquals(data.resolve("evidence"), evidence);
        assertFalse(Files.exists(data.resolve("clips")));
        assertTrue(Files.isRegularFile(evidence.resolve("gate/e1.mp4")), "the old files moved with the folder");
        // the next start finds nothing to move
        assertEquals(evidence, EvidenceFolder.upgrade(data));
        Retention.Result r = Retention.sweep(evidence, Duration.ofDays(30), Long.MAX_VALUE, NOW);
        assertEquals(1, r.eventsDeleted(), "the 40-day-old event, kept 30 days, is swept from the renamed folder");
        assertFalse(Files.exists(evidence.resolve("gate/e1.mp4")));
    }

    @Test
    void withBothFoldersBothStayAndTheLogSaysWhichIsUsed(@TempDir Path data) throws Exception {
        Path old = oldEvent(data.resolve("clips"), 1);
        Path current = oldEvent(data.resolve("evidence"), 1);
        try (LogCapture log = new LogCapture(EvidenceFolder.class)) {
            assertEquals(data.resolve("evidence"), EvidenceFolder.upgrade(data));
            assertEquals(1, log.lines().size(), log.lines().toString());
            assertTrue(log.lines().get(0).startsWith("WARN evidence: both " + data.resolve("clips") + " (from an older "
                    + "version) and " + data.resolve("evidence") + " exist; " + data.resolve("evidence") + " is used"),
                    log.lines().get(0));
        }
        assertTrue(Files.isRegularFile(old) && Files.isRegularFile(current), "nothing moved, nothing deleted");
    }

    @Test
    void aNewDataFolderNeedsNothing(@TempDir Path data) throws Exception {
        try (LogCapture log = new LogCapture(EvidenceFolder.class)) {
            assertEquals(data.resolve("evidence"), EvidenceFolder.upgrade(data));
            assertEquals(List.of(), log.lines());
        }
        assertFalse(Files.exists(data.resolve("evidence")), "created by the first event, not at start");
    }
}
