"""What a check is: findings and the rule registry."""
