package wayward.http;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.slf4j.LoggerFactory;
import wayward.delivery.LogCapture;

/** The error-line budget on a clock of our own: counted, not timed. */
class ErrorLinesTest {
    @Test
    void aFloodLogsTenLinesAMinuteAndCountsTheRest() {
        String name = "wayward.http.ErrorLinesTest.flood";
        ErrorLines lines = new ErrorLines(LoggerFactory.getLogger(name));
        try (LogCapture log = new LogCapture(name)) {
            long t = 0;
            for (int i = 0; i < 25; i++) {
                lines.error("bad " + i, t + i * 1_000_000L);
            }
            assertEquals(ErrorLines.LINES_PER_MINUTE, log.lines().size());
            assertEquals("ERROR bad 9", log.lines().get(9));
            lines.error("later", 61_000_000_000L);
            List<String> all = log.lines();
            assertEquals(List.of("WARN status server: 15 more error lines held back in the last minute",
                    "ERROR later"), all.subList(10, all.size()));
        }
    }
}
