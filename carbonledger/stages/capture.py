"""CO2 capture, compression, transport and storage.

The capture rate applies to the process CO2 only (pre-combustion capture on the shifted
syngas) or to process and flue CO2 (post-combustion capture as well). Gas burnt for capture
emits CO2 that is captured at the same rate only when the flue gas is treated.
"""


def captured_process_share(capture_rate, applies_to: str):
    """Fraction of the process CO2 that is captured."""
    return capture_rate


def captured_flue_share(capture_rate, applies_to: str):
    """Fraction of the flue CO2 that is captured (zero when capture treats process CO2 only)."""
    return capture_rate if applies_to == "process_and_flue" else 0.0 * capture_rate


def captured_co2_kg_per_kg_h2(process_co2, flue_co2, capture_rate, applies_to: str):
    return process_co2 * captured_process_share(capture_rate, applies_to) + flue_co2 * captured_flue_share(capture_rate, applies_to)


def compression_electricity_kwh_per_kg_co2(compression_kwh_per_t_co2):
    return compression_kwh_per_t_co2 / 1000.0


def capture_gas_gj_per_kg_co2(extra_natural_gas_gj_per_t_co2):
    return extra_natural_gas_gj_per_t_co2 / 1000.0


def transport_storage_leak_kg_per_kg_co2(transport_storage_loss_fraction):
    """CO2 released per kg of CO2 sent to transport and storage."""
    return transport_storage_loss_fraction
