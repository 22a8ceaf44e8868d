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

    @Test
    @Timeout(value = 60, unit = TimeUnit.SECONDS)
    void templateUnitPassesSystemdAnalyzeVerifyAsAnInstance(@org.junit.jupiter.api.io.TempDir java.nio.file.Path dir)
            throws Exception {
        // a template is verified as one of its instances: wayward@north.service
        java.nio.file.Path unit = dir.resolve("wayward@north.service");
        java.nio.file.Files.copy(java.nio.file.Path.of("systemd/wayward@.service"), unit);
        Process p = new ProcessBuilder("systemd-analyze", "verify", unit.toString()).redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        assertEquals(0, p.waitFor(), out);
        assertEquals("", out.trim(), "no warnings");
        String text = java.nio.file.Files.readString(unit);
        org.junit.jupiter.api.Assertions.assertTrue(text.contains("Environment=WAYWARD_INSTANCE=%i"), text);
    }
}
