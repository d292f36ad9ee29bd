"""[flame_response]: the Zeldovich number from two more flames per burning point, after the sweep.

With the Lewis numbers every flame has (chemistry.response.lewis_numbers), the Zeldovich number
gives the effective Lewis number, the Markstein number and the thermodiffusive regime
(design.response_columns, physics.flame_response), which the burner criteria read wherever present.

Parts: table.py, solve.py, task.py, report.py (flamecharts.analyses says what each declares).
"""
