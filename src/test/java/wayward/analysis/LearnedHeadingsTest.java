package wayward.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The kept learned heading reads back as the bearing that was written, to a tenth of a degree. */
class LearnedHeadingsTest {
    @Test
    void aBearingJustUnderAFullTurnReadsBackAsUp(@TempDir Path dir) throws Exception {
        // bearings wrap at 360° (common practice): 359.97° rounds to a tenth as 0.0°, not as 360.0°
        Path file = dir.resolve("lane.heading");
        LearnedHeadings.write(file, 359.97, 60);
        assertEquals(0.0, LearnedHeadings.read(file), 1e-9);
    }

    @Test
    void aBearingKeepsItsTenth(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("lane.heading");
        LearnedHeadings.write(file, 92.34, 60);
        assertEquals(92.3, LearnedHeadings.read(file), 1e-9);
    }
}
