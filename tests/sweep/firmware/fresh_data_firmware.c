/* Test firmware for `tickbench sweep` (tests/sweep): checks that each point starts from the
 * library's data as loaded, however many points its process ran before. It changes initialised
 * data, zeroed data and a large zeroed array, then checks that each held its loaded value when the
 * run started. Run alone, every run passes; a sweep passes at every point only if the data is put
 * back between points.
 */
#include <tickbench/firmware.h>

#include <stdint.h>

static uint32_t initialised = 0x5eed;
static uint32_t zeroed;
static uint8_t block[64 * 1024];

void tick_firmware_main(void) {
    const int fresh =
        initialised == 0x5eed && zeroed == 0 && block[0] == 0 && block[sizeof block - 1] == 0;
    initialised = initialised + 1;
    zeroed = zeroed + 1;
    block[0] = 1;
    block[sizeof block - 1] = 1;
    tick_cycles(10);
    tick_check(fresh, "the firmware's data is as loaded", "fresh_data_firmware.c", 0);
}
