"""CO2 capture, compression, transport and storage.

The capture rate applies to the process CO2 only (pre-combustion capture on the shifted
syngas) or to process and flue CO2 (post-combustion capture as well). Gas burnt for capture
emits CO2 that is captured at the same rate only when the flue gas is treated.
"""


def captured_process_share(capture_rate, applies_to: str):
    """Fraction of the process CO2 that is captured.

    Parameters
    ----------
    capture_rate : float or ndarray
        Share of the treated CO2 that the capture unit captures (dimensionless).
    applies_to : str
        What the capture treats: ``process`` CO2 only or ``process_and_flue``; the process CO2 is treated in both.

    Returns
    -------
    float or ndarray
        Captured share of the process CO2 (dimensionless).
    """
    return capture_rate


def captured_flue_share(capture_rate, applies_to: str):
    """Fraction of the flue CO2 that is captured (zero when capture treats process CO2 only).

    Parameters
    ----------
    capture_rate : float or ndarray
        Share of the treated CO2 that the capture unit captures (dimensionless).
    applies_to : str
        What the capture treats: ``process`` CO2 only or ``process_and_flue``.

    Returns
    -------
    float or ndarray
        Captured share of the flue CO2 (dimensionless).
    """
    return capture_rate if applies_to == "process_and_flue" else 0.0 * capture_rate


def captured_co2_kg_per_kg_h2(process_co2, flue_co2, capture_rate, applies_to: str):
    """CO2 captured per kg H2: the captured shares of the process and the flue CO2.

    Parameters
    ----------
    process_co2 : float or ndarray
        Concentrated process CO2 (shift, syngas clean-up), kg CO2 per kg H2.
    flue_co2 : float or ndarray
        Dilute flue CO2 (fired reformer, boilers), kg CO2 per kg H2.
    capture_rate : float or ndarray
        Share of the treated CO2 that the capture unit captures (dimensionless).
    applies_to : str
        What the capture treats: ``process`` CO2 only or ``process_and_flue``.

    Returns
    -------
    float or ndarray
        CO2 captured, kg CO2 per kg H2.
    """
    return process_co2 * captured_process_share(capture_rate, applies_to) + flue_co2 * captured_flue_share(
        capture_rate, applies_to
    )


def compression_electricity_kwh_per_kg_co2(compression_kwh_per_t_co2):
    """Electricity to compress captured CO2 for transport, per kg CO2.

    Parameters
    ----------
    compression_kwh_per_t_co2 : float or ndarray
        Electricity of compression, kWh per t CO2.

    Returns
    -------
    float or ndarray
        Electricity, kWh per kg CO2.
    """
    return compression_kwh_per_t_co2 / 1000.0


def capture_gas_gj_per_kg_co2(extra_natural_gas_gj_per_t_co2):
    """Natural gas burnt for the capture unit (solvent regeneration), per kg CO2 captured.

    Parameters
    ----------
    extra_natural_gas_gj_per_t_co2 : float or ndarray
        Extra natural gas, GJ (LHV) per t CO2 captured.

    Returns
    -------
    float or ndarray
        Natural gas, GJ (LHV) per kg CO2 captured.
    """
    return extra_natural_gas_gj_per_t_co2 / 1000.0


def transport_storage_leak_kg_per_kg_co2(transport_storage_loss_fraction):
    """CO2 released per kg of CO2 sent to transport and storage.

    Parameters
    ----------
    transport_storage_loss_fraction : float or ndarray
        Share of the CO2 sent that is lost in transport and storage (dimensionless).

    Returns
    -------
    float or ndarray
        CO2 released, kg per kg CO2 sent.
    """
    return transport_storage_loss_fraction
