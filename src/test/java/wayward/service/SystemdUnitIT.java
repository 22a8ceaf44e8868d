package wayward.service;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.charset.StandardCharsets;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;

/** The unit file as systemd itself reads it: {@code systemd-analyze verify} (Debian's systemd package). */
class SystemdUnitIT {
    @Test
    @Timeout(value = 60, unit = TimeUnit.SECONDS)
    void unitFilePassesSystemdAnalyzeVerify() throws Exception {
        Process p = new ProcessBuilder("systemd-analyze", "verify", "systemd/wayward.service")
                .redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        assertEquals(0, p.waitFor(), out);
        assertEquals("", out.trim(), "no warnings");
    }
}
